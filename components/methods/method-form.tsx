"use client";
// Writing a method down: what is measured and how it becomes a concentration, how runs are fitted, and the
// acceptance criteria each fit is judged against. Saving a change makes a new version, with a reason.
// react-hook-form holds the values (method-form-values.ts); zodResolver checks them with the route's own schema, so
// each field shows what the server would refuse before anything is sent, and the server's own refusals (a custom
// model whose test fit fails, say) are listed under Save.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useMemo } from "react";
import { useFieldArray, useForm, useWatch, type Resolver } from "react-hook-form";
import type { z } from "zod";
import { Button } from "@/components/ui/button";
import { Input, Select } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { problemLines, sendJson } from "@/lib/http/client";
import { fieldError, formMessages } from "@/components/forms/schema-form";
import type { MethodDefinition } from "@/lib/schemas/methods";
import { CRITERIA, formPath, METHOD_MODELS, methodFormDefaults, methodFormSchema, type MethodFormValues } from "./method-form-values";
import type { SavedVersion } from "@/lib/schemas/responses";

type Body = z.output<ReturnType<typeof methodFormSchema>>;

export function MethodForm({
  initial,
  calibrations,
  versionOf,
}: {
  initial?: MethodDefinition;
  calibrations: Array<{ id: number; name: string; analyte: string }>;
  /** Saving a new version of this method version. */
  versionOf?: { id: number; version: number };
}) {
  const router = useRouter();
  const toast = useToast();
  const resolver = useMemo((): Resolver<MethodFormValues, unknown, Body> => {
    const base = zodResolver(methodFormSchema(Boolean(versionOf)));
    // Criteria are numbered among the ticked ones in the body: each issue goes back to its own criterion's fields.
    return async (values, ctx, opts) => {
      const r = await base(values, ctx, opts);
      const crit = (r.errors as { definition?: { criteria?: Record<string, unknown> } }).definition?.criteria;
      if (crit) {
        const moved: Record<string, unknown> = {};
        for (const [j, e] of Object.entries(crit)) moved[formPath(`definition.criteria.${j}`, values).split(".")[2]!] = e;
        (r.errors as { definition: { criteria: unknown } }).definition.criteria = moved;
      }
      return r;
    };
  }, [versionOf]);
  const { register, handleSubmit, control, setError, formState } = useForm<MethodFormValues, unknown, Body>({ defaultValues: methodFormDefaults(initial, calibrations), resolver });
  const customs = useFieldArray({ control, name: "definition.custom_models" });
  const { errors, isSubmitting } = formState;
  const err = (path: string) => fieldError(errors, path);
  const concKind = useWatch({ control, name: "definition.concentration.kind" });
  const blankKind = useWatch({ control, name: "definition.blank.kind" });
  const criteria = useWatch({ control, name: "definition.criteria" });
  const reason = useWatch({ control, name: "reason" });

  const save = handleSubmit(
    async (body) => {
      let out: SavedVersion;
      try {
        out = await sendJson<SavedVersion>(versionOf ? `/api/methods/${versionOf.id}` : "/api/methods", { body });
      } catch (e) {
        const list = problemLines(e, /^definition\./);
        setError("root.server", { message: list.join(" · ") });
        toast(list[0]!, "fault");
        return;
      }
      toast(`Saved as version ${out.version}.`, "pass");
      router.push(`/methods/${out.id}`);
    },
    (invalid) => toast(formMessages(invalid, "", /^definition\./)[0] ?? "Check the marked fields.", "fault"),
  );
  const problems = formMessages(errors, "", /^definition\./);

  return (
    <form className="grid max-w-5xl gap-6 lg:grid-cols-2" onSubmit={save} noValidate>
      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
        <legend className="px-1 text-sm font-semibold">What is measured</legend>
        <Input label="Method name" {...register("definition.name")} error={err("definition.name")} required minLength={2} />
        <Input label="Analyte" {...register("definition.analyte")} error={err("definition.analyte")} required />
        <div className="grid grid-cols-2 gap-3">
          <Input label="Wavelength (nm)" inputMode="decimal" {...register("definition.wavelength_nm")} error={err("definition.wavelength_nm")} />
          <Input label="Path length (cm)" inputMode="decimal" {...register("definition.path_length_cm")} error={err("definition.path_length_cm")} />
        </div>
        <Select
          label="Concentration from"
          {...register("definition.concentration.kind")}
          options={[
            { value: "none", label: "Fit absorbance (no conversion)" },
            { value: "beer-lambert", label: "Molar absorptivity ε (Beer–Lambert)" },
            { value: "calibration", label: "A calibration curve" },
          ]}
        />
        {concKind === "beer-lambert" && <Input label="ε (L mol⁻¹ cm⁻¹)" inputMode="decimal" {...register("definition.concentration.epsilon")} error={err("definition.concentration.epsilon")} />}
        {concKind === "calibration" &&
          (calibrations.length ? (
            <Select label="Calibration curve" {...register("definition.concentration.calibration_id")} error={err("definition.concentration.calibration_id")} options={calibrations.map((c) => ({ value: String(c.id), label: `${c.name} (${c.analyte})` }))} />
          ) : (
            <p className="text-sm text-caution-700">No calibration curves yet: save one under Calibration curves first.</p>
          ))}
        <Select
          label="Blank"
          {...register("definition.blank.kind")}
          options={[
            { value: "none", label: "No blank correction" },
            { value: "channel", label: "A blank channel, subtracted at upload" },
            { value: "value", label: "A fixed blank absorbance" },
          ]}
        />
        {blankKind === "value" && <Input label="Blank absorbance (AU)" inputMode="decimal" {...register("definition.blank.value")} error={err("definition.blank.value")} />}
      </fieldset>

      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
        <legend className="px-1 text-sm font-semibold">How runs are fitted</legend>
        <div>
          <p className="text-sm font-semibold text-ink-700">Models (the first is the one the criteria judge)</p>
          {METHOD_MODELS.map((m) => (
            <label key={m.id} className="flex items-center gap-2 py-0.5 text-sm">
              <input type="checkbox" value={m.id} {...register("definition.models")} />
              {m.label}
            </label>
          ))}
          {err("definition.models") && <p role="alert" className="text-sm text-fault-700">{err("definition.models")}</p>}
        </div>
        <Select label="Weighting of the linearized fit" {...register("definition.weighting")} options={[{ value: "none", label: "None" }, { value: "log", label: "By (y − A∞)²" }]} />
        <div className="grid grid-cols-2 gap-3">
          <Input label="Window from (s)" inputMode="decimal" {...register("definition.window.from_s")} error={err("definition.window.from_s") ?? err("definition.window")} hint="Empty: from the first reading." />
          <Input label="Window to (s)" inputMode="decimal" {...register("definition.window.to_s")} error={err("definition.window.to_s")} hint="Empty: to the last reading." />
        </div>
        <div className="space-y-2">
          <p className="text-sm font-semibold text-ink-700">Custom models</p>
          {customs.fields.map((f, i) => (
            <div key={f.id} className="space-y-2 rounded-cell border border-ink-100 p-2">
              <Input label={`Custom model ${i + 1} name`} {...register(`definition.custom_models.${i}.name`)} error={err(`definition.custom_models.${i}.name`)} />
              <Input label={`Custom model ${i + 1} formula in t (s)`} {...register(`definition.custom_models.${i}.formula`)} error={err(`definition.custom_models.${i}.formula`)} placeholder="a*exp(-k*t) + c" />
              <Input label={`Custom model ${i + 1} start values`} {...register(`definition.custom_models.${i}.starts`)} error={err(`definition.custom_models.${i}.starts`)} placeholder="a=1, k=0.002, c=0.05" hint="Saved only if the formula reads and a test fit to its own curve converges." />
              <Button size="sm" variant="quiet" onClick={() => customs.remove(i)}>
                Remove
              </Button>
            </div>
          ))}
          <Button size="sm" variant="secondary" onClick={() => customs.append({ name: "", formula: "", starts: "" })}>
            Add a custom model
          </Button>
        </div>
      </fieldset>

      <fieldset className="space-y-2 rounded-cell bg-paper-raised p-4 shadow-lift lg:col-span-2">
        <legend className="px-1 text-sm font-semibold">Acceptance criteria</legend>
        <p className="text-sm text-ink-500">Every fit of a run with this method shows each ticked criterion as passed or failed, on the fitting page, in the fits list and in reports.</p>
        <div className="grid gap-2 md:grid-cols-2">
          {CRITERIA.map((c, i) => (
            <div key={c.kind} className="flex flex-wrap items-end gap-3 rounded-cell border border-ink-100 p-2">
              <label className="flex items-center gap-2 text-sm font-semibold">
                <input type="checkbox" {...register(`definition.criteria.${i}.on`)} aria-label={`Use: ${c.label}`} />
                <span className="w-32">{c.name}</span>
              </label>
              {c.fields.map((f) => (
                <div key={f.key} className="w-32">
                  <Input label={f.label} inputMode="decimal" {...register(`definition.criteria.${i}.${f.key}`)} readOnly={!criteria[i]!.on} aria-disabled={!criteria[i]!.on} className={criteria[i]!.on ? undefined : "opacity-50"} error={err(`definition.criteria.${i}.${f.key}`) ?? (f.key !== "max" ? err(`definition.criteria.${i}`) : undefined)} />
                </div>
              ))}
            </div>
          ))}
        </div>
      </fieldset>

      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift lg:col-span-2">
        <legend className="px-1 text-sm font-semibold">Save</legend>
        <label className="block text-sm font-semibold text-ink-700" htmlFor="method-notes">
          Notes for analysts (handling, cautions, references)
        </label>
        <textarea id="method-notes" rows={3} {...register("definition.notes")} className="block w-full rounded-cell border border-ink-300 bg-paper-raised px-3 py-2 text-sm" />
        {versionOf && <Input label="Why this new version (required)" {...register("reason")} error={err("reason")} required minLength={3} />}
        {problems.length > 0 && (
          <ul role="alert" className="list-disc pl-5 text-sm text-fault-700" data-testid="method-problems">
            {problems.map((e) => (
              <li key={e}>{e}</li>
            ))}
          </ul>
        )}
        <Button type="submit" disabled={isSubmitting || (Boolean(versionOf) && (reason ?? "").trim().length < 3)} data-testid="save-method">
          {isSubmitting ? "Checking and saving…" : versionOf ? `Save version ${versionOf.version + 1}` : "Save method"}
        </Button>
      </fieldset>
    </form>
  );
}
