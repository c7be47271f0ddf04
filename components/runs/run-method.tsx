"use client";
// A run's method: shown, and assigned or changed (with a reason) by those who upload runs.
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { Input, Select } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { useWatch } from "react-hook-form";
import { fieldError, useSchemaForm } from "@/components/forms/schema-form";
import { problemText, sendJson } from "@/lib/http/client";
import { assignMethodSchema } from "@/lib/schemas/methods";
import type { MethodAssigned } from "@/lib/schemas/responses";

interface Values {
  methodId: string;
  reason: string;
  wavelengthReason: string;
}

export function RunMethod({
  runId,
  runWavelength,
  current,
  choices,
  canAssign,
}: {
  runId: number;
  runWavelength: number | null;
  current: { record_id: number; name: string } | null;
  choices: Array<{ record_id: number; name: string; version: number; wavelength_nm: number | null }>;
  canAssign: boolean;
}) {
  const router = useRouter();
  const toast = useToast();
  const [open, setOpen] = useState(false);
  // The same rule as the server's (more than 1 nm apart): the dialog asks for the reason before the server must.
  const mismatchOf = (choice: string) => {
    const chosen = choices.find((c) => String(c.record_id) === choice);
    return chosen && chosen.wavelength_nm !== null && runWavelength !== null && Math.abs(chosen.wavelength_nm - runWavelength) > 1 ? chosen.wavelength_nm : null;
  };
  const toBody = (v: Values) => ({ methodId: v.methodId ? Number(v.methodId) : null, reason: v.reason, ...(mismatchOf(v.methodId) !== null ? { wavelengthReason: v.wavelengthReason } : {}) });
  const { register, handleSubmit, control, reset, formState } = useSchemaForm<Values, typeof assignMethodSchema>(toBody, assignMethodSchema, { methodId: String(current?.record_id ?? choices[0]?.record_id ?? ""), reason: "", wavelengthReason: "" });
  const [choice, reason, wavelengthReason] = useWatch({ control, name: ["methodId", "reason", "wavelengthReason"] });
  const mismatch = mismatchOf(choice);
  const err = (path: keyof Values) => fieldError(formState.errors, path);
  const assign = handleSubmit(async (body) => {
    let out: MethodAssigned;
    try {
      out = await sendJson<MethodAssigned>(`/api/runs/${runId}/method`, { body });
    } catch (e) {
      toast(problemText(e), "fault");
      return;
    }
    toast(out.method ? `Method set to ${out.method.name} (v${out.method.version}).` : "Method cleared.", "pass");
    setOpen(false);
    reset({ methodId: choice, reason: "", wavelengthReason: "" });
    router.refresh();
  });
  return (
    <span data-testid="run-method">
      {current ? (
        <Link className="text-quartz-700 underline" href={`/methods/${current.record_id}`}>
          {current.name}
        </Link>
      ) : (
        <span className="text-ink-500">none</span>
      )}
      {canAssign && (
        <Button size="sm" variant="quiet" className="ml-2" onClick={() => setOpen(true)}>
          {current ? "Change" : "Assign"}
        </Button>
      )}
      <Dialog open={open} onClose={() => setOpen(false)} title="Method of this run">
        <form className="space-y-4" onSubmit={assign} noValidate>
          <Select label="Method" {...register("methodId")} error={err("methodId")} options={[{ value: "", label: "No method" }, ...choices.map((c) => ({ value: String(c.record_id), label: `${c.name} (v${c.version})` }))]} />
          <Input label="Reason (required)" {...register("reason")} error={err("reason")} required minLength={3} />
          {mismatch !== null && (
            <div className="rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700" data-testid="wavelength-mismatch">
              <p>
                This method is for {mismatch} nm; the run was measured at {runWavelength} nm. Its absorptivity or calibration and its criteria may not hold here.
              </p>
              <Input label="Why the method applies at this wavelength (required)" {...register("wavelengthReason")} error={err("wavelengthReason")} required minLength={3} />
            </div>
          )}
          <p className="text-sm text-ink-500">Fits saved from now on are judged by the method&apos;s newest version; saved fits keep their verdict.</p>
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Cancel
            </Button>
            <Button type="submit" disabled={formState.isSubmitting || (reason ?? "").trim().length < 3 || (mismatch !== null && (wavelengthReason ?? "").trim().length < 3)}>
              Save
            </Button>
          </div>
        </form>
      </Dialog>
    </span>
  );
}
