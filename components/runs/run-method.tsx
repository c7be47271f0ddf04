"use client";
// A run's method: shown, and assigned or changed (with a reason) by those who upload runs.
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { Input, Select } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { problemText, sendJson } from "@/lib/http/client";

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
  const [choice, setChoice] = useState(String(current?.record_id ?? choices[0]?.record_id ?? ""));
  const [reason, setReason] = useState("");
  const [wavelengthReason, setWavelengthReason] = useState("");
  const [busy, setBusy] = useState(false);
  const chosen = choices.find((c) => String(c.record_id) === choice);
  // The same rule as the server's (more than 1 nm apart): the dialog asks for the reason before the server must.
  const mismatch = chosen && chosen.wavelength_nm !== null && runWavelength !== null && Math.abs(chosen.wavelength_nm - runWavelength) > 1 ? chosen.wavelength_nm : null;
  async function assign() {
    setBusy(true);
    let body: { method: { name: string; version: number } | null };
    try {
      body = await sendJson<{ method: { name: string; version: number } | null }>(`/api/runs/${runId}/method`, { body: { methodId: choice ? Number(choice) : null, reason, ...(mismatch !== null ? { wavelengthReason } : {}) } });
    } catch (e) {
      toast(problemText(e), "fault");
      return;
    } finally {
      setBusy(false);
    }
    toast(body.method ? `Method set to ${body.method.name} (v${body.method.version}).` : "Method cleared.", "pass");
    setOpen(false);
    setReason("");
    router.refresh();
  }
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
        <form
          className="space-y-4"
          onSubmit={(e) => {
            e.preventDefault();
            void assign();
          }}
        >
          <Select label="Method" value={choice} onChange={(e) => setChoice(e.target.value)} options={[{ value: "", label: "No method" }, ...choices.map((c) => ({ value: String(c.record_id), label: `${c.name} (v${c.version})` }))]} />
          <Input label="Reason (required)" value={reason} onChange={(e) => setReason(e.target.value)} required minLength={3} />
          {mismatch !== null && (
            <div className="rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700" data-testid="wavelength-mismatch">
              <p>
                This method is for {mismatch} nm; the run was measured at {runWavelength} nm. Its absorptivity or calibration and its criteria may not hold here.
              </p>
              <Input label="Why the method applies at this wavelength (required)" value={wavelengthReason} onChange={(e) => setWavelengthReason(e.target.value)} required minLength={3} />
            </div>
          )}
          <p className="text-sm text-ink-500">Fits saved from now on are judged by the method&apos;s newest version; saved fits keep their verdict.</p>
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Cancel
            </Button>
            <Button type="submit" disabled={busy || reason.trim().length < 3 || (mismatch !== null && wavelengthReason.trim().length < 3)}>
              Save
            </Button>
          </div>
        </form>
      </Dialog>
    </span>
  );
}
