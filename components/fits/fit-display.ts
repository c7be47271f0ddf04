// What the fitting page draws from a fit, decimated where the fit is computed (the Web Worker), so a million-point
// series never crosses to the page's main thread as curves: the points by kind (included, excluded, outside the
// window), each model's curve and residuals, and the linearized view, each at most a few points per plot column.
import { includedFlags, type SeriesFitOptions, type SeriesFitOutcome } from "@/lib/kinetics/workspace";
import { decimate, decimateIndices } from "@/lib/plot/decimate";

/**
 * Buckets of the main plot the decimator fills: one per 2 pixels of its ~900-pixel width (markers are 5–8 pixels wide,
 * so the drawn shape is the same as per pixel); the small plots use half. Each marker is one SVG element that plotly
 * styles on every redraw, so this is what a changed option costs on the main thread (bench page: 900 buckets, a changed
 * option at 100k points 0.76–0.89 s, most of it plotly styling markers).
 */
export const PLOT_COLUMNS = 450;

export interface FitDisplay {
  /** Indices into the series of the points drawn, by kind. */
  shown: { inc: number[]; ex: number[]; out: number[]; total: number };
  curves: Record<string, { fitted: { x: number[]; y: number[] }; residuals: { x: number[]; y: number[] } }>;
  linear: { x: number[]; y: number[] } | null;
}

/** The outcome without its full-length curves (what crosses to the page beside the display). */
export type SlimOutcome = Omit<SeriesFitOutcome, "curves" | "linearized_view"> & { linearized_view: { line: NonNullable<SeriesFitOutcome["linearized_view"]>["line"] } | null };

/** The decimated subset of the points at `idx` (indices into the series). */
function thinIndices(t: ArrayLike<number>, y: ArrayLike<number>, idx: number[]): number[] {
  const ts = new Float64Array(idx.length),
    ys = new Float64Array(idx.length);
  idx.forEach((i, j) => ((ts[j] = t[i]!), (ys[j] = y[i]!)));
  return decimateIndices(ts, ys, PLOT_COLUMNS).map((j) => idx[j]!);
}

/** The points by kind (fitted, excluded, outside the window): every excluded one, the others decimated. */
function shownPoints(t: ArrayLike<number>, y: ArrayLike<number>, included: ArrayLike<boolean>, excluded: ReadonlySet<number>): FitDisplay["shown"] {
  const inc: number[] = [],
    ex: number[] = [],
    out: number[] = [];
  for (let i = 0; i < t.length; i++) (included[i] ? inc : excluded.has(i) ? ex : out).push(i);
  return { inc: thinIndices(t, y, inc), ex, out: thinIndices(t, y, out), total: t.length };
}

/**
 * What the page draws while its first fit is being computed: the points by kind, as the fit will take them (the
 * engine's own rule, `includedFlags`), and no curves yet. The page is usable meanwhile.
 */
export function pointsDisplay(t: ArrayLike<number>, y: ArrayLike<number>, excluded: ReadonlySet<number>, window: SeriesFitOptions["window"] = {}): FitDisplay {
  return { shown: shownPoints(t, y, includedFlags(t, excluded, window), excluded), curves: {}, linear: null };
}

export function fitDisplay(outcome: SeriesFitOutcome, t: ArrayLike<number>, y: ArrayLike<number>, excluded: ReadonlySet<number>): { outcome: SlimOutcome; display: FitDisplay } {
  const curves: FitDisplay["curves"] = {};
  for (const [model, c] of Object.entries(outcome.curves)) {
    curves[model] = { fitted: decimate(c.t, c.fitted, PLOT_COLUMNS), residuals: decimate(c.t, c.residuals, PLOT_COLUMNS / 2) };
  }
  const lv = outcome.linearized_view;
  const { curves: _c, linearized_view: _l, ...rest } = outcome;
  return {
    outcome: { ...rest, linearized_view: lv ? { line: lv.line } : null },
    display: { shown: shownPoints(t, y, outcome.included, excluded), curves, linear: lv ? decimate(lv.t, lv.ln, PLOT_COLUMNS / 2) : null },
  };
}
