// First-order rate constants from straight lines: the linearized fit ln|y − A∞| on t, and, for an unknown A∞,
// Guggenheim's and Kezdy–Swinbourne's methods over pairs of readings a fixed interval apart.
import { aicc, durbinWatson, runsTest } from "./diagnostics";
import { outOfRangeAtZero } from "./models/types";
import { failedFit } from "./nls";
import { fitLine, RegressionError, type LineFit } from "./regression";
import type { FitResult, ParameterEstimate } from "./types";

function est(name: string, value: number, se: number | null, tCrit: number, fixed = false): ParameterEstimate {
  return { name, value, se, ci95: se === null || fixed ? null : [value - tCrit * se, value + tCrit * se], fixed };
}

function lineResult(model: string, line: LineFit, parameters: ParameterEstimate[], message: string, warnings: string[], weighting: FitResult["weighting"], xs: ArrayLike<number>): FitResult {
  const rt = runsTest(line.residuals);
  return {
    model,
    n: line.n,
    parameters,
    ssr: line.ssr,
    dof: line.dof,
    r2: line.r2,
    rmse: Math.sqrt(line.ssr / line.n),
    aicc: aicc(line.ssr, line.n, 2),
    runs: rt.runs,
    runs_z: rt.z,
    runs_p: rt.p,
    durbin_watson: durbinWatson(line.residuals),
    converged: true,
    iterations: 0,
    message,
    correlation: null,
    correlation_names: [],
    warnings,
    weighting,
    residuals: Float64Array.from(line.residuals),
    fitted: Float64Array.from(xs, (x) => line.intercept + line.slope * x),
    line_x: Float64Array.from(xs),
  };
}

/** An amplitude at t = 0 from a line's intercept: out of range when t = 0 lies far before the readings (Unix time). */
function amplitudeAtZero(name: string, value: number, ts: readonly number[], line: LineFit): { ok: boolean; note: string | null } {
  if (Number.isFinite(value) && value !== 0) return { ok: true, note: null };
  const first = Math.min(...ts);
  const atFirst = Math.exp(line.intercept + line.slope * first);
  return {
    ok: false,
    note: outOfRangeAtZero(name, first, atFirst),
  };
}

export interface LinearizedOptions {
  ainf: number;
  /** Where A∞ came from, said in the message. */
  ainfSource: string;
  /** Weight each point by (y − A∞)², which undoes the log transform's stretching of the noisy tail. */
  weighted?: boolean;
}

export function linearizedFirstOrder(t: ArrayLike<number>, y: ArrayLike<number>, opts: LinearizedOptions): FitResult {
  const params = ["k", "a0", "ainf"];
  const n = t.length;
  let above = 0;
  for (let i = 0; i < n; i++) if (y[i]! > opts.ainf) above++;
  const sign = above >= n - above ? 1 : -1; // decay above A∞, or rise below it
  const ts: number[] = [],
    ln: number[] = [],
    w: number[] = [];
  const dropped: number[] = [];
  for (let i = 0; i < n; i++) {
    const d = sign * (y[i]! - opts.ainf);
    if (d > 0 && Number.isFinite(d)) {
      ts.push(t[i]!);
      ln.push(Math.log(d));
      w.push(d * d);
    } else dropped.push(i + 1);
  }
  const warnings: string[] = [];
  if (dropped.length)
    warnings.push(`${dropped.length} point(s) at or beyond A∞ = ${opts.ainf} have no logarithm and were left out (points ${dropped.slice(0, 10).join(", ")}${dropped.length > 10 ? ", …" : ""}).`);
  let line: LineFit;
  try {
    line = fitLine(ts, ln, opts.weighted ? { weights: w } : {});
  } catch (e) {
    if (e instanceof RegressionError) return failedFit("linearized", params, n, `No fit: ${e.message}`, { ainf: opts.ainf });
    throw e;
  }
  const amp = Math.exp(line.intercept);
  const a0 = amplitudeAtZero("a0", amp, ts, line);
  if (a0.note) warnings.push(a0.note);
  const parameters = [
    est("k", -line.slope, line.seSlope, line.tCrit),
    a0.ok ? est("a0", opts.ainf + sign * amp, line.seIntercept === null ? null : amp * line.seIntercept, line.tCrit) : { name: "a0", value: null, se: null, ci95: null, fixed: false },
    est("ainf", opts.ainf, null, line.tCrit, true),
  ];
  const message = `Least squares of ln(${sign > 0 ? "y − ainf" : "ainf − y"}) on t${opts.weighted ? ", weighted by (y − ainf)²" : ""}; ainf ${opts.ainfSource}. r2, ssr and residuals are those of the straight line (log units).`;
  return lineResult("linearized", line, parameters, message, warnings, opts.weighted ? "relative" : "none", ts);
}

/** Pairs of readings whose times differ by the interval (to 1 part in 10⁶ of it). */
export function pairsAtInterval(t: ArrayLike<number>, interval: number): Array<[number, number]> {
  const pairs: Array<[number, number]> = [];
  const tol = Math.abs(interval) * 1e-6 + 1e-12;
  let j = 0;
  for (let i = 0; i < t.length; i++) {
    const target = t[i]! + interval;
    while (j < t.length && t[j]! < target - tol) j++;
    if (j < t.length && Math.abs(t[j]! - target) <= tol) pairs.push([i, j]);
  }
  return pairs;
}

/**
 * The interval that pairs readings: the one asked for when at least three pairs of readings are that far apart, else the
 * nearest multiple of the readings' usual spacing (their median step) that does, with a note saying so.
 */
export function snapInterval(t: ArrayLike<number>, interval: number, snap = true): { interval: number; pairs: Array<[number, number]>; note: string | null } {
  const asked = pairsAtInterval(t, interval);
  if (!snap || asked.length >= 3 || t.length < 4) return { interval, pairs: asked, note: null };
  const steps: number[] = [];
  for (let i = 1; i < t.length; i++) if (t[i]! > t[i - 1]!) steps.push(t[i]! - t[i - 1]!);
  if (!steps.length) return { interval, pairs: asked, note: null };
  steps.sort((a, b) => a - b);
  const dt = steps[Math.floor(steps.length / 2)]!;
  const base = Math.max(1, Math.round(interval / dt));
  for (const m of [base, base - 1, base + 1, base - 2, base + 2]) {
    if (m < 1) continue;
    const snapped = Number((m * dt).toPrecision(12));
    const pairs = pairsAtInterval(t, snapped);
    if (pairs.length >= 3)
      return { interval: snapped, pairs, note: `No readings are ${interval} s apart; the nearest interval that pairs them, ${snapped} s (${m} × the ${Number(dt.toPrecision(6))} s spacing of the readings), was used.` };
  }
  return { interval, pairs: asked, note: null };
}

export function guggenheim(t: ArrayLike<number>, y: ArrayLike<number>, intervalAsked: number, snap = false): FitResult {
  const params = ["k", "amplitude"];
  if (!(intervalAsked > 0)) return failedFit("guggenheim", params, t.length, "No fit: the Guggenheim method needs an interval, a positive time (2–3 half-lives is usual).");
  const snapped = snapInterval(t, intervalAsked, snap);
  const { interval, pairs } = snapped;
  const diffs = pairs.map(([i, j]) => y[i]! - y[j]!);
  const pos = diffs.filter((d) => d > 0).length;
  const sign = pos >= diffs.length - pos ? 1 : -1;
  const ts: number[] = [],
    ln: number[] = [];
  pairs.forEach(([i], q) => {
    const d = sign * diffs[q]!;
    if (d > 0) {
      ts.push(t[i]!);
      ln.push(Math.log(d));
    }
  });
  const warnings: string[] = snapped.note ? [snapped.note] : [];
  if (ts.length < pairs.length) warnings.push(`${pairs.length - ts.length} pair${pairs.length - ts.length === 1 ? "" : "s"} with no decrease over the interval ${pairs.length - ts.length === 1 ? "was" : "were"} left out.`);
  let line: LineFit;
  try {
    line = fitLine(ts, ln);
  } catch (e) {
    if (e instanceof RegressionError)
      return failedFit("guggenheim", params, pairs.length, `No fit: ${pairs.length === 0 ? "no" : `only ${pairs.length}`} pair${pairs.length === 1 ? "" : "s"} of readings ${pairs.length === 1 ? "is" : "are"} ${interval} s apart; choose an interval that is a multiple of the readings' spacing and leaves at least three pairs.`);
    throw e;
  }
  const amp = Math.exp(line.intercept);
  const amplitude = sign * amp * (1 - Math.exp(line.slope * interval)) ** -1;
  const at0 = amplitudeAtZero("amplitude", amplitude, ts, line);
  if (at0.note) warnings.push(at0.note);
  const parameters = [
    est("k", -line.slope, line.seSlope, line.tCrit),
    at0.ok ? est("amplitude", amplitude, null, line.tCrit) : { name: "amplitude", value: null, se: null, ci95: null, fixed: false },
  ];
  return lineResult("guggenheim", line, parameters, `Least squares of ln|y(t) − y(t + ${interval} s)| on t over ${ts.length} pairs; A∞ not needed.`, warnings, "none", ts);
}

export function kezdySwinbourne(t: ArrayLike<number>, y: ArrayLike<number>, intervalAsked: number, snap = false): FitResult {
  const params = ["k", "ainf"];
  if (!(intervalAsked > 0)) return failedFit("kezdy-swinbourne", params, t.length, "No fit: the Kezdy–Swinbourne method needs an interval, a positive time.");
  const snapped = snapInterval(t, intervalAsked, snap);
  const { interval, pairs } = snapped;
  const a = pairs.map(([i]) => y[i]!);
  const b = pairs.map(([, j]) => y[j]!);
  let line: LineFit;
  try {
    line = fitLine(a, b);
  } catch (e) {
    if (e instanceof RegressionError)
      return failedFit("kezdy-swinbourne", params, pairs.length, `No fit: ${pairs.length === 0 ? "no" : `only ${pairs.length}`} pair${pairs.length === 1 ? "" : "s"} of readings ${pairs.length === 1 ? "is" : "are"} ${interval} s apart; choose an interval that is a multiple of the readings' spacing and leaves at least three pairs.`);
    throw e;
  }
  const s = line.slope,
    c = line.intercept;
  if (!(s > 0 && s < 1))
    return failedFit("kezdy-swinbourne", params, pairs.length, `No fit: the slope of y(t + Δ) on y(t) is ${s.toPrecision(4)}, outside (0, 1), so it gives no first-order rate constant.`);
  const k = -Math.log(s) / interval;
  const seK = line.seSlope / (s * interval);
  const ainf = c / (1 - s);
  const dc = 1 / (1 - s),
    ds = c / (1 - s) ** 2;
  const varAinf = dc * dc * line.seIntercept! ** 2 + ds * ds * line.seSlope ** 2 + 2 * dc * ds * line.covSlopeIntercept!;
  const parameters = [est("k", k, seK, line.tCrit), est("ainf", ainf, Math.sqrt(Math.max(0, varAinf)), line.tCrit)];
  return lineResult(
    "kezdy-swinbourne",
    line,
    parameters,
    `Least squares of y(t + ${interval} s) on y(t) over ${pairs.length} pairs: k = −ln(slope)/interval, ainf = intercept/(1 − slope); SEs by the delta method.`,
    snapped.note ? [snapped.note] : [],
    "none",
    a,
  );
}
