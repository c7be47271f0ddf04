"use client";
// The lab administrator's integrity check: recomputes the audit trail and every record version, and says what it found.
import { useState } from "react";
import { Button } from "@/components/ui/button";
import type { LabIntegrity } from "@/lib/integrity";
import { problemText, sendJson } from "@/lib/http/client";

export function IntegrityCheck() {
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<LabIntegrity | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function run() {
    setBusy(true);
    setError(null);
    try {
      setResult(await sendJson<LabIntegrity>("/api/admin/integrity", { body: {} }));
    } catch (e) {
      setError(problemText(e));
    } finally {
      setBusy(false);
    }
  }

  return (
    <section className="mb-6 rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Integrity check" data-testid="integrity-check">
      <div className="flex flex-wrap items-center gap-3">
        <Button onClick={run} disabled={busy}>
          {busy ? "Checking…" : "Check integrity"}
        </Button>
        <p className="text-sm text-ink-700">Recomputes every row of the audit trail under the audit key, and every fit, study and method version from what is stored. The check itself is recorded.</p>
      </div>
      {error && <p role="alert" className="mt-3 rounded-cell bg-fault-100 px-3 py-2 text-sm text-fault-700">{error}</p>}
      {result && (
        <div className={`mt-3 rounded-cell px-3 py-2 text-sm ${result.intact ? "bg-pass-100 text-pass-700" : "bg-fault-100 text-fault-700"}`} role="status" data-testid="integrity-result">
          <p className="font-semibold">
            {result.intact
              ? `Integrity verified: ${result.audit.rows} audit rows and ${result.records.checked} record versions recomputed, nothing changed.`
              : "Tampering found: the items below no longer match what was recorded."}
          </p>
          <ul className="mt-1 list-disc pl-5">
            {result.audit.problems.map((p) => (
              <li key={p}>Audit trail: {p}</li>
            ))}
            {result.records.failed.map((f) => (
              <li key={`${f.kind}-${f.id}`}>
                {f.kind.replace(/s$/, "")} {f.id}: {f.problems.join(" ")}
              </li>
            ))}
          </ul>
          {result.audit.unkeyed_rows > 0 && <p className="mt-1 text-ink-700">{result.audit.unkeyed_rows} older rows were written before the audit key: they are checked by their hash chain only.</p>}
        </div>
      )}
    </section>
  );
}
