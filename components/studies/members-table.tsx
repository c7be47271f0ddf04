"use client";
// A study's members: each fit's k with its SE, its residual on the Arrhenius line and the temperature used; on the
// newest version, temperatures corrected with a reason, fits left out or added, and a new version saved with why.
import Link from "next/link";
import type { Dispatch } from "react";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import type { StudyRecord } from "@/lib/studies";
import { temperatureChanged, type StudyEditAction, type StudyEdits } from "./study-state";

export function MembersTable({ study, residuals, editable, edits: e, dispatch, candidates, busy, onSave }: {
  study: StudyRecord;
  residuals: ReadonlyArray<{ residual: number } | undefined>;
  editable: boolean;
  edits: StudyEdits;
  dispatch: Dispatch<StudyEditAction>;
  candidates: ReadonlyArray<{ id: number; label: string }>;
  busy: boolean;
  onSave: () => void;
}) {
  return (
    <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Members">
      <h2 className="mb-3 text-lg font-semibold">Members</h2>
      <table className="w-full text-sm [&_td]:px-2 [&_th]:px-2">
        <thead>
          <tr className="text-left text-ink-500">
            <th className="py-1">Fit</th>
            <th>Run</th>
            <th className="text-right">k (s⁻¹)</th>
            <th className="text-right">Residual (ln k)</th>
            <th>Temperature (°C)</th>
            <th>Reason for a changed temperature</th>
            {editable && <th>Leave out</th>}
          </tr>
        </thead>
        <tbody>
          {study.members.map((m, i) => (
            <tr key={m.fitId} className="border-t border-ink-100 align-top">
              <td className="py-1.5">
                <Link className="text-quartz-700 hover:underline" href={`/fits/${m.fitId}`}>
                  {m.fit_title}
                </Link>{" "}
                <span className="text-ink-500">v{m.fit_version}</span>
              </td>
              <td>{m.run_name}</td>
              <td className="num text-right font-mono">{formatWithUncertainty(m.k, m.se)}</td>
              <td className="num text-right font-mono">{residuals[i] ? formatNumber(residuals[i]!.residual, 3) : "—"}</td>
              <td>
                {editable ? (
                  <input
                    aria-label={`Temperature of ${m.run_name}`}
                    className="h-8 w-24 rounded-cell border border-ink-300 px-2"
                    value={e.temps[m.fitId] ?? String(m.temperature_used_c)}
                    onChange={(ev) => dispatch({ type: "temperature", fitId: m.fitId, value: ev.target.value })}
                  />
                ) : (
                  m.temperature_used_c
                )}
                {m.temperature_reason && <span className="block text-xs text-ink-500">run says {m.run_temperature_c ?? "nothing"} °C</span>}
              </td>
              <td>
                {editable && temperatureChanged(e, m) ? (
                  <input aria-label={`Why ${m.run_name} is at this temperature`} className="h-8 w-full rounded-cell border border-ink-300 px-2" value={e.reasons[m.fitId] ?? ""} onChange={(ev) => dispatch({ type: "reason", fitId: m.fitId, value: ev.target.value })} />
                ) : (
                  <span className="text-ink-500">{m.temperature_reason ?? ""}</span>
                )}
              </td>
              {editable && (
                <td>
                  <input type="checkbox" aria-label={`Leave ${m.run_name} out`} checked={e.removed.includes(m.fitId)} onChange={(ev) => dispatch({ type: "leave-out", fitId: m.fitId, out: ev.target.checked })} />
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
      {editable && (
        <div className="mt-4 flex flex-wrap items-end gap-3">
          <div className="w-72">
            <Input label="Study name" value={e.name} onChange={(ev) => dispatch({ type: "set", field: "name", value: ev.target.value })} />
          </div>
          <div className="w-96 max-w-full">
            <Input label="Add a fit" list="study-fit-choices" value={e.added} onChange={(ev) => dispatch({ type: "set", field: "added", value: ev.target.value })} hint="Type part of its title, run or temperature and pick it." />
            <datalist id="study-fit-choices">
              {candidates.map((c) => (
                <option key={c.id} value={c.label} />
              ))}
            </datalist>
          </div>
          <div className="w-96">
            <Input label="Why this new version (required)" value={e.why} onChange={(ev) => dispatch({ type: "set", field: "why", value: ev.target.value })} />
          </div>
          <Button onClick={onSave} disabled={busy || e.why.trim().length < 3} data-testid="save-study">
            Save version {study.version + 1}
          </Button>
        </div>
      )}
    </section>
  );
}
