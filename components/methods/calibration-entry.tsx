"use client";
// Entering a calibration: the curve's fields, standards pasted or read from a file (with the delimited parser's table
// finder, lib/methods/standards.ts), the standards table, and the line's options.
import { useState, type Dispatch } from "react";
import { Button } from "@/components/ui/button";
import { Input, Select } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import type { CalibrationWeighting, SigmaSource } from "@/lib/kinetics/quantities";
import { readStandards } from "@/lib/methods/standards";
import { toNumber, type CalibrationAction, type CalibrationState } from "./calibration-state";

export function CalibrationEntry({ state: s, dispatch, readOnly, count }: { state: CalibrationState; dispatch: Dispatch<CalibrationAction>; readOnly: boolean; count: number }) {
  const toast = useToast();
  const [paste, setPaste] = useState("");
  const [pasteProblems, setPasteProblems] = useState<string[]>([]);
  const set = <K extends Exclude<keyof CalibrationState, "rows">>(field: K, value: CalibrationState[K]) => dispatch({ type: "set", field, value } as CalibrationAction);

  function applyPaste(text: string) {
    const { rows, problems } = readStandards(text);
    setPasteProblems(problems);
    if (rows.length) {
      dispatch({ type: "use-rows", rows });
      toast(`${rows.length} standards read.`, "info");
    }
  }

  return (
    <>
      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift" disabled={readOnly}>
        <legend className="px-1 text-sm font-semibold">Curve</legend>
        <Input label="Name" value={s.name} onChange={(e) => set("name", e.target.value)} />
        <Input label="Analyte" value={s.analyte} onChange={(e) => set("analyte", e.target.value)} />
        <div className="grid grid-cols-2 gap-3">
          <Input label="Concentration unit" value={s.unit} onChange={(e) => set("unit", e.target.value)} />
          <Input label="λ (nm)" inputMode="decimal" value={s.wavelength} onChange={(e) => set("wavelength", e.target.value)} />
        </div>
      </fieldset>
      {!readOnly && (
        <fieldset className="space-y-2 rounded-cell bg-paper-raised p-4 shadow-lift">
          <legend className="px-1 text-sm font-semibold">Paste or read a file</legend>
          <label className="block text-sm font-semibold text-ink-700" htmlFor="cal-paste">
            Cells from a spreadsheet: concentration, absorbance, replicate
          </label>
          <textarea id="cal-paste" value={paste} onChange={(e) => setPaste(e.target.value)} rows={5} className="block w-full rounded-cell border border-ink-300 bg-paper-raised px-3 py-2 font-mono text-sm" placeholder={"0\t0.002\t1\n2\t0.176\t1"} />
          <div className="flex flex-wrap items-center gap-2">
            <Button size="sm" variant="secondary" onClick={() => applyPaste(paste)} disabled={!paste.trim()}>
              Use pasted rows
            </Button>
            <label className="cursor-pointer text-sm font-semibold text-quartz-700 underline">
              Read a CSV export…
              <input
                type="file"
                accept=".csv,.txt,text/csv,text/plain"
                className="sr-only"
                onChange={async (e) => {
                  const f = e.target.files?.[0];
                  if (f) applyPaste(await f.text());
                }}
              />
            </label>
          </div>
          {pasteProblems.map((p) => (
            <p key={p} role="alert" className="text-sm text-fault-700">{p}</p>
          ))}
        </fieldset>
      )}
      <fieldset className="rounded-cell bg-paper-raised p-4 shadow-lift" disabled={readOnly}>
        <legend className="px-1 text-sm font-semibold">Standards ({count})</legend>
        <table className="w-full text-sm" data-testid="standards">
          <thead>
            <tr className="text-left text-xs text-ink-500">
              <th className="pb-1 font-semibold">c ({s.unit})</th>
              <th className="pb-1 font-semibold">A (AU)</th>
              <th className="pb-1 font-semibold">Rep.</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {s.rows.map((r, i) => (
              <tr key={i}>
                {(["concentration", "absorbance", "replicate"] as const).map((k) => (
                  <td key={k} className="pr-1 pb-1">
                    <input
                      aria-label={`Standard ${i + 1} ${k}`}
                      inputMode="decimal"
                      value={r[k]}
                      onChange={(e) => dispatch({ type: "cell", row: i, column: k, value: e.target.value })}
                      className={`h-8 w-full rounded-cell border bg-paper-raised px-2 font-mono ${r[k].trim() !== "" && Number.isNaN(toNumber(r[k])) ? "border-fault-700" : "border-ink-300"}`}
                    />
                  </td>
                ))}
                <td className="pb-1">
                  {!readOnly && (
                    <button type="button" aria-label={`Remove standard ${i + 1}`} className="px-1 text-ink-500 hover:text-fault-700" onClick={() => dispatch({ type: "remove-row", row: i })}>
                      ×
                    </button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {!readOnly && (
          <Button size="sm" variant="quiet" onClick={() => dispatch({ type: "add-row" })}>
            Add a standard
          </Button>
        )}
      </fieldset>
      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift" disabled={readOnly}>
        <legend className="px-1 text-sm font-semibold">Line and σ</legend>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" checked={s.origin} onChange={(e) => set("origin", e.target.checked)} /> Through the origin
        </label>
        <Select label="Weights" value={s.weighting} onChange={(e) => set("weighting", e.target.value as CalibrationWeighting)} options={[{ value: "none", label: "None (ordinary least squares)" }, { value: "1/x", label: "1/x" }, { value: "1/x2", label: "1/x²" }]} />
        <Select
          label="σ for LOD and LOQ"
          value={s.sigma}
          onChange={(e) => set("sigma", e.target.value as SigmaSource)}
          options={[{ value: "residual", label: "Residual SD of the line" }, { value: "intercept", label: "SE of the intercept" }, { value: "blank", label: "SD of blank measurements" }]}
        />
        {s.sigma === "blank" && <Input label="SD of the blanks (AU)" inputMode="decimal" value={s.blankSd} onChange={(e) => set("blankSd", e.target.value)} />}
      </fieldset>
    </>
  );
}
