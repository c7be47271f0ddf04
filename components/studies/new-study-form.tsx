"use client";
// Making a study: choose the fit versions whose rate constants go in, name it, save (checked with the route's schema).
import { useRouter } from "next/navigation";
import { useWatch } from "react-hook-form";
import { fieldError, formMessages, useSchemaForm } from "@/components/forms/schema-form";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { formatWithUncertainty } from "@/lib/format/number";
import { problemText, sendJson } from "@/lib/http/client";
import { createStudySchema } from "@/lib/schemas/studies";
import type { Created } from "@/lib/schemas/responses";

interface FitChoice {
  id: number;
  title: string;
  version: number;
  k: number | null;
  se: number | null;
  temperature_c: number | null;
  run_name: string;
}

interface Values {
  name: string;
  /** The ticked fits' ids (a lone checkbox gives its value or false rather than a list). */
  members: string[] | string | false;
  weighted: boolean;
}

const ids = (m: Values["members"]) => (Array.isArray(m) ? m : m ? [m] : []);
const toBody = (v: Values) => ({ name: v.name, kind: "temperature", members: ids(v.members).map((id) => ({ fitId: Number(id) })), options: { weighted: v.weighted, target_c: 25 } });

export function NewStudyForm({ fits }: { fits: FitChoice[] }) {
  const router = useRouter();
  const toast = useToast();
  const { register, handleSubmit, control, formState } = useSchemaForm<Values, typeof createStudySchema>(toBody, createStudySchema, { name: "", members: [], weighted: true });
  const [name, members] = useWatch({ control, name: ["name", "members"] });
  const chosen = ids(members).length;
  if (fits.length === 0) return <p className="text-sm text-ink-500">Save fits of runs first; a study groups their rate constants.</p>;

  const submit = handleSubmit(
    async (body) => {
      let out: Created;
      try {
        out = await sendJson<Created>("/api/studies", { body });
      } catch (e) {
        return toast(problemText(e), "fault");
      }
      router.push(`/studies/${out.id}`);
    },
    (invalid) => toast(formMessages(invalid)[0] ?? "Check the marked fields.", "fault"),
  );

  return (
    <form className="rounded-cell bg-paper-raised p-5 shadow-lift" onSubmit={submit} noValidate>
      <div className="mb-4 max-w-md">
        <Input label="Study name" {...register("name")} error={fieldError(formState.errors, "name")} />
      </div>
      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Fits to include (one rate constant each)</legend>
        <ul className="grid gap-1 sm:grid-cols-2">
          {fits.map((f) => (
            <li key={f.id}>
              <label className="flex items-center gap-2 text-sm">
                <input type="checkbox" value={String(f.id)} {...register("members")} />
                <span>
                  {f.title} <span className="text-ink-500">v{f.version} · {f.temperature_c ?? "?"} °C · k {formatWithUncertainty(f.k, f.se)} s⁻¹</span>
                </span>
              </label>
            </li>
          ))}
        </ul>
        {fieldError(formState.errors, "members") && <p role="alert" className="mt-1 text-sm text-fault-700">{fieldError(formState.errors, "members")}</p>}
      </fieldset>
      <label className="mt-3 flex items-center gap-2 text-sm">
        <input type="checkbox" {...register("weighted")} />
        Weight each rate constant by (k / SE(k))²
      </label>
      <Button type="submit" className="mt-4" disabled={formState.isSubmitting || !(name ?? "").trim() || chosen < 2} data-testid="create-study">
        {formState.isSubmitting ? "Saving…" : `Make the study (${chosen} fits)`}
      </Button>
    </form>
  );
}
