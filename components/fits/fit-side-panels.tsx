"use client";
// The fitting page's side panels below the options: the rate at a chosen time, the excluded points with their
// reasons, and saving the fit as a record version.
import type { Dispatch } from "react";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import { ExcludeByNumber } from "./exclusion-dialog";
import type { FitAction, FitPageState } from "./fit-state";

export interface RateAt {
  model: number;
  data: { rate: number; se: number; points: number } | null;
}

export function RatePanel({ state: s, dispatch, rate, yUnit }: { state: FitPageState; dispatch: Dispatch<FitAction>; rate: RateAt | null; yUnit: string }) {
  const f = s.perMinute ? 60 : 1;
  return (
    <fieldset className="space-y-2 rounded-cell bg-paper-raised p-4 shadow-lift">
      <legend className="px-1 text-sm font-semibold">Rate at a time</legend>
      <Input label={`At t (${s.perMinute ? "min" : "s"})`} inputMode="decimal" value={s.rateAt} onChange={(e) => dispatch({ type: "set", field: "rateAt", value: e.target.value })} hint="−dy/dt from the nonlinear first-order fit, and a local straight line through the data (±5 % of the span)." />
      {rate && (
        <p className="num text-sm" data-testid="rate">
          model: {formatNumber(rate.model * f, 4)} {yUnit} {s.perMinute ? "min⁻¹" : "s⁻¹"}
          <br />
          data: {rate.data ? `${formatWithUncertainty(rate.data.rate * f, rate.data.se * f)} (${rate.data.points} points)` : "too few points near this time"}
        </p>
      )}
    </fieldset>
  );
}

export function ExclusionsPanel({ state: s, dispatch, t, excluded }: { state: FitPageState; dispatch: Dispatch<FitAction>; t: ArrayLike<number>; excluded: Set<number> }) {
  const tScale = s.perMinute ? 60 : 1;
  return (
    <fieldset className="rounded-cell bg-paper-raised p-4 shadow-lift">
      <legend className="px-1 text-sm font-semibold">Excluded points ({s.exclusions.length})</legend>
      {s.exclusions.length === 0 ? (
        <p className="text-sm text-ink-500">None. Click a point on the plot to exclude it.</p>
      ) : (
        <ul className="space-y-1 text-sm" data-testid="exclusions">
          {s.exclusions.map((e) => (
            <li key={e.index} className="flex items-start justify-between gap-2">
              <span>
                <span className="font-mono">#{e.index + 1}</span> at {formatNumber(t[e.index]! / tScale, 4)} {s.perMinute ? "min" : "s"}: {e.reason}
              </span>
              <button type="button" className="text-quartz-700 underline" onClick={() => dispatch({ type: "restore", index: e.index })}>
                restore
              </button>
            </li>
          ))}
        </ul>
      )}
      <ExcludeByNumber n={t.length} excluded={excluded} onPick={(i) => dispatch({ type: "ask-exclusion", indices: [i] })} />
    </fieldset>
  );
}

export function SavePanel({ state: s, dispatch, from, saving, onSave }: { state: FitPageState; dispatch: Dispatch<FitAction>; from: { version: number } | null; saving: boolean; onSave: () => void }) {
  return (
    <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
      <legend className="px-1 text-sm font-semibold">Save</legend>
      <Input label="Title" value={s.title} onChange={(e) => dispatch({ type: "set", field: "title", value: e.target.value })} />
      {from && <Input label="Why this new version (required)" value={s.saveReason} onChange={(e) => dispatch({ type: "set", field: "saveReason", value: e.target.value })} />}
      <Button onClick={onSave} disabled={saving || (Boolean(from) && s.saveReason.trim().length < 3)} className="w-full" data-testid="save-fit">
        {saving ? "Saving…" : from ? `Save version ${from.version + 1}` : "Save fit record"}
      </Button>
      <p className="text-xs text-ink-500">The server re-runs the fit and keeps every version; nothing is overwritten.</p>
    </fieldset>
  );
}
