"use client";
// The fitting page's option controls: models (and an own formula), start values, the pairing interval, the window,
// a fixed A∞, weighting, time unit, and the conversion to concentration. Each change is one action on the page's state.
import type { Dispatch } from "react";
import { Input } from "@/components/ui/field";
import { formatNumber } from "@/lib/format/number";
import { FORMULA_FUNCTIONS } from "@/lib/kinetics/formula";
import { MODELS } from "@/lib/kinetics/models";
import type { FitAction, FitPageState } from "./fit-state";
import { TimeInput } from "./time-input";

export function FitControls({ state: s, dispatch, onModels }: { state: FitPageState; dispatch: Dispatch<FitAction>; onModels: (next: string[]) => void }) {
  const tScale = s.perMinute ? 60 : 1;
  const set = <K extends Exclude<keyof FitPageState, "calibrationConv" | "startConv">>(field: K) => (value: FitPageState[K]) => dispatch({ type: "set", field, value } as FitAction);
  return (
    <>
      <fieldset className="rounded-cell bg-paper-raised p-4 shadow-lift">
        <legend className="px-1 text-sm font-semibold">Models</legend>
        {MODELS.map((m) => (
          <label key={m.id} className="flex items-center gap-2 py-0.5 text-sm">
            <input type="checkbox" checked={s.models.includes(m.id)} onChange={(e) => onModels(e.target.checked ? [...s.models, m.id] : s.models.filter((x) => x !== m.id))} />
            {m.label}
          </label>
        ))}
        {s.models.includes("formula") && (
          <div className="mt-2">
            <Input label="Formula in t (seconds)" value={s.formula} onChange={(e) => set("formula")(e.target.value)} placeholder="b1*(1-exp(-b2*t)) + b3" hint={`Standard notation: + − * / ^ and brackets, ${FORMULA_FUNCTIONS.join(", ")}, pi. Every other name is a parameter.`} />
          </div>
        )}
        <div className="mt-2">
          <Input label="Start values (advanced)" value={s.startsText} onChange={(e) => set("startsText")(e.target.value)} placeholder="k=0.002, b1=1" hint="Per second. Built-in models find their own; formulas start at 1." />
        </div>
        {(s.models.includes("guggenheim") || s.models.includes("kezdy-swinbourne")) && (
          <div className="mt-2">
            <TimeInput label="Interval for Guggenheim / Kezdy–Swinbourne" seconds={s.interval} scale={tScale} onSeconds={set("interval")} hint="Pairs of readings this far apart (a multiple of their spacing); 2–3 half-lives is usual." />
          </div>
        )}
      </fieldset>
      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
        <legend className="px-1 text-sm font-semibold">Window and A∞</legend>
        <div className="grid grid-cols-2 gap-3">
          <TimeInput label="From" seconds={s.windowFrom} scale={tScale} onSeconds={set("windowFrom")} />
          <TimeInput label="To" seconds={s.windowTo} scale={tScale} onSeconds={set("windowTo")} />
        </div>
        <Input label="Fix A∞ at (measured)" inputMode="decimal" value={s.fixAinf} onChange={(e) => set("fixAinf")(e.target.value)} hint="Empty: A∞ is fitted (and estimated for the linearized view)." />
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" checked={s.logWeights} onChange={(e) => set("logWeights")(e.target.checked)} />
          Weight the linearized fit by (y − A∞)²
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" checked={s.perMinute} onChange={(e) => set("perMinute")(e.target.checked)} />
          Show times in minutes and k per minute (stored in seconds)
        </label>
      </fieldset>
      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
        <legend className="px-1 text-sm font-semibold">Concentration</legend>
        {s.calibrationConv && (
          <label className="flex items-start gap-2 text-sm">
            <input type="checkbox" checked={s.useCalibration} onChange={(e) => set("useCalibration")(e.target.checked)} />
            <span>
              Convert by calibration {s.calibrationConv.calibrationId}: c = (A − {formatNumber(s.calibrationConv.intercept, 4)}) / {formatNumber(s.calibrationConv.slope, 5)} ({s.calibrationConv.unit})
            </span>
          </label>
        )}
        {!(s.useCalibration && s.calibrationConv) && (
          <>
            <Input label="ε (L mol⁻¹ cm⁻¹)" inputMode="decimal" value={s.epsilon} onChange={(e) => set("epsilon")(e.target.value)} hint="Beer–Lambert. Empty: fit absorbance." />
            <Input label="Path length b (cm)" inputMode="decimal" value={s.pathLength} onChange={(e) => set("pathLength")(e.target.value)} />
          </>
        )}
      </fieldset>
    </>
  );
}
