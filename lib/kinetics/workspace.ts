// One series, several models, one set of options: the window, excluded points, fixed values, starts, an optional
// Beer–Lambert conversion. The fitting page (in the browser) and the fit records (on the server) both call this, so a
// saved record is the same computation the analyst saw.
import { akaikeWeights } from "./diagnostics";
import { fitKinetics, FitSpecError } from "./fit";
import { failedFit } from "./nls";
import { modelById } from "./models";
import { beerLambertConcentration, halfLife, t90 } from "./quantities";
import type { FitResult } from "./types";

export interface SeriesFitOptions {
  models: string[];
  formula?: string | null;
  window?: { from?: number | null; to?: number | null };
  /** Indices into the stored series, each with the analyst's reason. */
  exclusions?: Array<{ index: number; reason: string }>;
  /** Held values, applied to every model that has the parameter (e.g. a measured ainf). */
  fixed?: Record<string, number>;
  starts?: Record<string, number>;
  /** Seconds, for Guggenheim and Kezdy–Swinbourne. */
  interval?: number | null;
  /** Linearized fit weighted by (y − A∞)². */
  logWeights?: boolean;
  conversion?: Conversion | null;
}

/**
 * Absorbance to concentration: Beer–Lambert with ε and b, or a calibration line A = b0 + b1·c (its slope's SE is
 * carried into rate constants whose units contain concentration).
 */
export type Conversion =
  | { kind: "beer-lambert"; epsilon: number; pathLengthCm: number; blank?: number | null }
  | { kind: "calibration"; calibrationId: number; slope: number; seSlope: number; intercept: number; unit: string; blank?: number | null };

export function convertReading(a: number, c: Conversion): number {
  if (c.kind === "beer-lambert") return beerLambertConcentration(a, { epsilon: c.epsilon, pathLengthCm: c.pathLengthCm, blank: c.blank ?? 0 });
  return (a - (c.blank ?? 0) - c.intercept) / c.slope;
}

export interface ModelOutcome {
  model: string;
  result: Omit<FitResult, "residuals" | "fitted">;
  akaikeWeight: number | null;
  halfLife: { value: number; se: number | null } | null;
  t90: { value: number; se: number | null } | null;
}

export interface SeriesFitOutcome {
  n: number;
  included: boolean[];
  quantity: "absorbance" | "concentration";
  models: ModelOutcome[];
  /** Smallest and largest fitted reading as measured (before any conversion); null when nothing was fitted. */
  reading_range: [number, number] | null;
  /** The model the statistics favour among the comparable ones, and why, in plain words. */
  favoured: { model: string; why: string } | null;
  notes: string[];
  /** Residuals and fitted values per model, over the included points (for plots; not stored in records). */
  curves: Record<string, { t: Float64Array; fitted: Float64Array; residuals: Float64Array }>;
  /** The linearized fit as a plot: ln|y − A∞| of the points it used against t, and its line (not stored in records). */
  linearized_view: { t: Float64Array; ln: Float64Array; line: { t: [number, number]; ln: [number, number] } } | null;
}

/** Which points a fit takes: those inside the window (ends included) and not excluded. The one rule for fits and plots. */
export function includedFlags(tAll: ArrayLike<number>, excluded: ReadonlySet<number>, window: SeriesFitOptions["window"]): boolean[] {
  const from = window?.from ?? -Infinity;
  const to = window?.to ?? Infinity;
  return Array.from({ length: tAll.length }, (_, i) => !excluded.has(i) && tAll[i]! >= from && tAll[i]! <= to);
}

/** The points a fit with these options uses: inside the window, not excluded, finite, converted as the options say. */
export function includedPoints(tAll: ArrayLike<number>, yAll: ArrayLike<number>, o: Pick<SeriesFitOptions, "window" | "exclusions" | "conversion">): { t: Float64Array; y: Float64Array } {
  const included = includedFlags(tAll, new Set((o.exclusions ?? []).map((e) => e.index)), o.window);
  const t: number[] = [],
    y: number[] = [];
  for (let i = 0; i < tAll.length; i++) {
    if (!included[i]) continue;
    const v = o.conversion ? convertReading(yAll[i]!, o.conversion) : yAll[i]!;
    if (!Number.isFinite(v)) continue;
    t.push(tAll[i]!);
    y.push(v);
  }
  return { t: Float64Array.from(t), y: Float64Array.from(y) };
}

export function fitSeriesWithOptions(tAll: ArrayLike<number>, yAll: ArrayLike<number>, o: SeriesFitOptions): SeriesFitOutcome {
  const n = tAll.length;
  const excluded = new Set((o.exclusions ?? []).map((e) => e.index));
  const included = includedFlags(tAll, excluded, o.window);
  const t: number[] = [],
    y: number[] = [];
  let lo = Infinity,
    hi = -Infinity;
  for (let i = 0; i < n; i++)
    if (included[i]) {
      const v = yAll[i]!;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
      t.push(tAll[i]!);
      y.push(o.conversion ? convertReading(v, o.conversion) : v);
    }
  const readingRange: [number, number] | null = t.length ? [lo, hi] : null;
  const notes: string[] = [];
  if (excluded.size) notes.push(`${excluded.size} point(s) excluded by the analyst, each with a reason.`);
  if (o.window && (o.window.from != null || o.window.to != null)) {
    const at = (s: number) => (s >= 120 ? `${Number((s / 60).toPrecision(6))} min (${s} s)` : `${s} s`);
    notes.push(`Fitting window: ${o.window.from != null ? `from ${at(o.window.from)}` : "from the first reading"} ${o.window.to != null ? `to ${at(o.window.to)}` : "to the last reading"}.`);
  }
  if (o.conversion?.kind === "beer-lambert")
    notes.push(`Absorbance converted to concentration by Beer–Lambert: ε = ${o.conversion.epsilon} L mol⁻¹ cm⁻¹, b = ${o.conversion.pathLengthCm} cm${o.conversion.blank ? `, blank ${o.conversion.blank}` : ""}.`);
  if (o.conversion?.kind === "calibration")
    notes.push(
      `Absorbance converted to concentration (${o.conversion.unit}) by calibration ${o.conversion.calibrationId}: c = (A − ${o.conversion.intercept.toPrecision(5)}) / ${o.conversion.slope.toPrecision(5)}. A first-order k does not change under this linear conversion, so the calibration's uncertainty does not enter it; for zero- and second-order k the slope's relative SE is added in quadrature.`,
    );

  const tt = Float64Array.from(t),
    yy = Float64Array.from(y);
  const curves: SeriesFitOutcome["curves"] = {};
  let linearizedView: SeriesFitOutcome["linearized_view"] = null;
  const raw = o.models.map((model) => {
    const d = modelById(model);
    const params = !d || d.family === "formula" ? null : d.params.map((p) => p.name);
    const fixed = Object.fromEntries(Object.entries(o.fixed ?? {}).filter(([k]) => params === null || params.includes(k)));
    const starts = Object.fromEntries(Object.entries(o.starts ?? {}).filter(([k]) => params === null || params.includes(k)));
    let r: FitResult;
    try {
      r = fitKinetics(tt, yy, {
        model: model === "formula" ? undefined : model,
        formula: model === "formula" ? (o.formula ?? "") : undefined,
        fixed,
        start: Object.keys(starts).length ? starts : undefined,
        interval: o.interval ?? undefined,
        snapInterval: true,
        logWeights: o.logWeights,
      });
    } catch (e) {
      // A formula that cannot be read is a failed fit of that model, said in its message, not a failed page.
      if (!(e instanceof FitSpecError)) throw e;
      r = failedFit(model, [], tt.length, `No fit: ${e.message}`);
    }
    const { residuals, fitted, line_x, ...rest } = r;
    if (model === "linearized" && r.converged && line_x && line_x.length > 1)
      linearizedView = { t: line_x, ln: fitted.map((f, i) => f + residuals[i]!), line: { t: [line_x[0]!, line_x[line_x.length - 1]!], ln: [fitted[0]!, fitted[fitted.length - 1]!] } };
    if (o.conversion?.kind === "calibration" && d?.kScalesWithConcentration) {
      const cal = o.conversion;
      rest.parameters = rest.parameters.map((p) =>
        p.name === "k" && p.value !== null && p.se !== null ? { ...p, se_with_calibration: Math.abs(p.value) * Math.hypot(p.se / p.value, cal.seSlope / cal.slope) } : p,
      );
    }
    curves[model] = { t: d?.family === "straight-line" ? Float64Array.from([]) : tt, fitted, residuals };
    const k = r.parameters.find((p) => p.name === "k");
    return {
      model,
      result: rest,
      halfLife: d?.firstOrderK && k?.value ? halfLife(k.value, k.se) : null,
      t90: d?.firstOrderK && k?.value ? t90(k.value, k.se) : null,
    };
  });
  const weights = akaikeWeights(raw.map((m) => (modelById(m.model)?.comparable && m.result.converged ? m.result.aicc : null)));
  const models: ModelOutcome[] = raw.map((m, i) => ({ ...m, akaikeWeight: weights[i] ?? null }));
  let favoured: SeriesFitOutcome["favoured"] = null;
  const ranked = models.filter((m) => m.akaikeWeight !== null).sort((a, b) => b.akaikeWeight! - a.akaikeWeight!);
  if (ranked.length >= 2) {
    const [best, next] = ranked as [ModelOutcome, ModelOutcome];
    const ratio = best.akaikeWeight! / Math.max(next.akaikeWeight!, 1e-300);
    favoured = {
      model: best.model,
      why:
        ratio > 10
          ? `${best.model} has the lowest AICc; its Akaike weight is ${best.akaikeWeight!.toFixed(3)}, more than ten times that of ${next.model}, so the data clearly favour it.`
          : `${best.model} has the lowest AICc, but ${next.model} is close (weights ${best.akaikeWeight!.toFixed(2)} and ${next.akaikeWeight!.toFixed(2)}): the data do not clearly separate them.`,
    };
  } else if (ranked.length === 1) {
    favoured = { model: ranked[0]!.model, why: "the only model here whose sum of squares is in the data's own units." };
  }
  const disagreement = linearizedDisagreement(models, o.logWeights ?? false);
  if (disagreement) notes.push(disagreement);
  return { n: t.length, included, quantity: o.conversion ? "concentration" : "absorbance", reading_range: readingRange, models, favoured, notes, curves, linearized_view: linearizedView };
}

/** Beyond this many combined standard errors, the linearized and the nonlinear k disagree. */
export const K_DISAGREEMENT_Z = 3;

/** The linearized and the nonlinear first-order k compared through their uncertainties, said in words when they disagree. */
export function linearizedDisagreement(models: readonly ModelOutcome[], logWeights: boolean): string | null {
  const k = (id: string) => models.find((m) => m.model === id && m.result.converged)?.result.parameters.find((p) => p.name === "k");
  const kl = k("linearized"),
    kn = k("first-order");
  if (!kl?.value || !kn?.value || kl.se === null || kn.se === null) return null;
  const z = Math.abs(kl.value - kn.value) / Math.hypot(kl.se, kn.se);
  if (!(z > K_DISAGREEMENT_Z)) return null;
  return `The linearized and nonlinear first-order k disagree: they differ by ${(100 * Math.abs(kl.value / kn.value - 1)).toFixed(1)} %, ${z.toFixed(1)} times their combined standard error. ${
    logWeights
      ? "Even weighted, the log transform follows a wrong or drifting A∞; check A∞ and prefer the nonlinear fit."
      : "The unweighted log transform stretches the noisy tail, and a wrong or drifting A∞ bends the line: prefer the nonlinear fit, or weight the linearized fit by (y − A∞)²."
  }`;
}
