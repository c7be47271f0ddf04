"use client";
// The fitting page's plots: data with the fitted curves (click to exclude, box-select, the window as a band), the
// residuals of each model, and the linearized view. Points are decimated for display; fits use every point.
import { useMemo, type Dispatch } from "react";
import { Plot } from "@/components/plot/plot";
import { Button } from "@/components/ui/button";
import { CHANNEL_PALETTE } from "@/lib/colour/wavelength";
import { axes, lineTrace, markerTrace, pointTrace, windowBand, type Series } from "@/components/plot/traces";
import type { FitDisplay, SlimOutcome } from "./fit-display";
import type { FitAction } from "./fit-state";

const colourOf = (i: number) => CHANNEL_PALETTE[(i + 1) % CHANNEL_PALETTE.length]!;

export function FitPlots(props: {
  points: Series;
  /** Null while the first fit is being computed: the points are drawn, the curves follow. */
  outcome: SlimOutcome | null;
  display: FitDisplay;
  curveModels: ReadonlySet<string>;
  tScale: number;
  yLabel: string;
  colour: string;
  conv: (v: number) => number;
  window: { from: number | null; to: number | null };
  tangent: { x: number[]; y: number[] } | null;
  selected: number[];
  excluded: ReadonlySet<number>;
  dispatch: Dispatch<FitAction>;
  onPointClick: (index: number) => void;
}) {
  const { points, outcome, display, tScale, dispatch, conv, colour, tangent, curveModels, yLabel } = props;
  const { shown } = display;
  const tLabel = tScale === 60 ? "t (min)" : "t (s)";
  const thinned = shown.inc.length + shown.out.length + shown.ex.length < shown.total;
  const linearView = outcome?.linearized_view ?? null;
  const { from, to } = props.window;
  // Traces and layouts keep their identity until what they show changes: every new identity makes plotly redraw and
  // restyle every marker, so a re-render for anything else (the busy flag, a typed field) must not hand it new arrays.
  const fitted = useMemo(() => (outcome?.models ?? []).filter((m) => curveModels.has(m.model) && m.result.converged), [outcome, curveModels]);
  const mainData = useMemo(() => {
    const scale = { t: tScale, y: conv };
    return [
      pointTrace("included", shown.inc, points, scale, { color: colour, size: 6 }),
      pointTrace("excluded", shown.ex, points, scale, { color: "#5d687c", size: 8, symbol: "x" }),
      pointTrace("outside the window", shown.out, points, scale, { color: "#8a94a6", size: 7, symbol: "circle-open" }),
      ...fitted.map((m, i) => {
        const c = display.curves[m.model]!.fitted;
        return lineTrace(`${m.model} fit`, c.x, c.y, tScale, { color: colourOf(i), width: 2 });
      }),
      ...(tangent ? [lineTrace("tangent (model)", tangent.x, tangent.y, tScale, { color: "#1b2230", dash: "dash", width: 1.5 })] : []),
    ];
  }, [shown, points, tScale, conv, colour, fitted, display, tangent]);
  const mainLayout = useMemo(() => axes(tLabel, yLabel, { shapes: windowBand(from, to, points.t, tScale), clickmode: "event" }), [tLabel, yLabel, from, to, points, tScale]);
  const residualData = useMemo(
    () =>
      fitted.map((m, i) => {
        const r = display.curves[m.model]!.residuals;
        return markerTrace(m.model, r.x, r.y, tScale, { size: 5, color: colourOf(i) });
      }),
    [fitted, display, tScale],
  );
  const residualLayout = useMemo(() => ({ xaxis: { title: { text: tLabel } }, yaxis: { title: { text: "y − fitted" }, zeroline: true } }), [tLabel]);
  const linearData = useMemo(
    () => (linearView && display.linear ? [markerTrace("ln|y − A∞|", display.linear.x, display.linear.y, tScale, { size: 5, color: colour }), lineTrace("line", linearView.line.t, linearView.line.ln, tScale, { color: "#d55e00" })] : null),
    [linearView, display, tScale, colour],
  );
  const linearLayout = useMemo(() => axes(tLabel, "ln|y − A∞|"), [tLabel]);
  return (
    <>
      <section className="rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Data and fitted curves">
        <Plot
          label="Data and fitted curves"
          height={340}
          data={mainData}
          layout={mainLayout}
          onClick={(e) => {
            const pt = e.points?.[0] as { customdata?: unknown } | undefined;
            if (typeof pt?.customdata === "number") props.onPointClick(pt.customdata);
          }}
          onSelected={(e) => {
            const idx = (e?.points ?? []).map((p) => (p as { customdata?: unknown }).customdata).filter((v): v is number => typeof v === "number");
            dispatch({ type: "set", field: "selected", value: idx.filter((i) => !props.excluded.has(i)) });
          }}
        />
        {props.selected.length > 0 && (
          <div className="mt-2 flex flex-wrap items-center gap-2 rounded-cell bg-quartz-100 px-3 py-2 text-sm" data-testid="selection-bar">
            <span>{props.selected.length} point(s) selected</span>
            <Button size="sm" variant="secondary" onClick={() => dispatch({ type: "ask-exclusion", indices: props.selected })}>
              Exclude them…
            </Button>
            <Button size="sm" variant="secondary" onClick={() => dispatch({ type: "window-of-selection", times: props.selected.map((i) => points.t[i]!) })}>
              Fit only their time range
            </Button>
            <Button size="sm" variant="quiet" onClick={() => dispatch({ type: "set", field: "selected", value: [] })}>
              Clear
            </Button>
          </div>
        )}
        <p className="mt-1 text-xs text-ink-500">
          Click a point to exclude it (you will be asked why); click an excluded point (×) to restore it; open rings are outside the fitting window; or use the box-select tool to pick several.{" "}
          {thinned ? `Shown: the first, lowest and highest reading of each plot column (${(shown.inc.length + shown.out.length + shown.ex.length).toLocaleString("en")} points); fits use all ${shown.total.toLocaleString("en")}.` : ""}
        </p>
      </section>

      <section className="grid gap-4 lg:grid-cols-2">
        <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
          <h2 className="mb-1 text-sm font-semibold uppercase tracking-wide text-ink-700">Residuals</h2>
          {outcome ? <Plot label="Residuals per model" height={220} data={residualData} layout={residualLayout} /> : <FirstFitPending />}
        </div>
        <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
          <h2 className="mb-1 text-sm font-semibold uppercase tracking-wide text-ink-700">Linearized view</h2>
          {!outcome ? (
            <FirstFitPending />
          ) : linearData ? (
            <Plot label="ln|y − A∞| against time" height={220} data={linearData} layout={linearLayout} />
          ) : (
            <p className="text-sm text-ink-500">Add the linearized first-order model to see ln|y − A∞| against t.</p>
          )}
        </div>
      </section>
    </>
  );
}

function FirstFitPending() {
  return <div className="flex h-[220px] items-center justify-center rounded-cell bg-paper-sunk text-sm text-ink-500">Shown once the first fit is in.</div>;
}
