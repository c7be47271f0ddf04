// Across temperatures: weighted Arrhenius and Eyring regressions, the two-point activation energy, Q10, predicted
// rate constants with prediction intervals, and the mean kinetic temperature.
import { BOLTZMANN_KB, GAS_R, KELVIN_OFFSET, LN_KB_OVER_H, PLANCK_H } from "./constants";
import { fitLine, predictLine } from "./regression";
import { tQuantile } from "./stats";

export interface Estimate {
  value: number;
  se: number | null;
  ci95?: [number, number] | null;
  unit?: string;
}

export interface RatePoint {
  /** Kelvin. */
  temperatureK: number;
  k: number;
  /** Standard error of k, when known: the fit is then weighted by (k / se)². */
  se?: number | null;
}

export interface ArrheniusResult {
  n: number;
  method: "least-squares" | "two-point";
  weighted: boolean;
  ea: Estimate & { unit: "J/mol" };
  lnA: Estimate;
  /** Correlation of Ea and ln A (near −1 unless 1/T is centred). */
  corrEaLnA: number | null;
  r2: number | null;
  dof: number;
  eyring: { dH: Estimate & { unit: "J/mol" }; dS: Estimate & { unit: "J/(mol K)" } };
  temperatureRangeK: [number, number];
  warnings: string[];
}

export class TemperatureDataError extends Error {
  override name = "TemperatureDataError";
}

export function celsiusToKelvin(c: number): number {
  return c + KELVIN_OFFSET;
}

function checkPoints(points: readonly RatePoint[]): void {
  if (points.length < 2) throw new TemperatureDataError(`An activation energy needs rate constants at two temperatures at least; got ${points.length}.`);
  points.forEach((p, i) => {
    if (!(p.temperatureK > 0)) throw new TemperatureDataError(`Point ${i + 1}: the temperature ${p.temperatureK} K is not above absolute zero.`);
    if (!(p.k > 0)) throw new TemperatureDataError(`Point ${i + 1}: the rate constant ${p.k} is not positive, so it has no logarithm.`);
    if (p.se != null && !(p.se > 0)) throw new TemperatureDataError(`Point ${i + 1}: the standard error ${p.se} is not positive.`);
  });
  if (new Set(points.map((p) => p.temperatureK)).size < 2) throw new TemperatureDataError("All rate constants are at one temperature: no activation energy can be derived.");
}

/** Ea = R·ln(k2/k1)/(1/T1 − 1/T2). */
export function twoPointEa(a: RatePoint, b: RatePoint): number {
  return (GAS_R * Math.log(b.k / a.k)) / (1 / a.temperatureK - 1 / b.temperatureK);
}

export function arrhenius(points: readonly RatePoint[]): ArrheniusResult {
  checkPoints(points);
  const T = points.map((p) => p.temperatureK);
  const range: [number, number] = [Math.min(...T), Math.max(...T)];
  const warnings: string[] = [];
  if (points.length === 2) {
    const [a, b] = points as [RatePoint, RatePoint];
    const ea = twoPointEa(a, b);
    const lnA = Math.log(a.k) + ea / (GAS_R * a.temperatureK);
    // Eyring from the line through the two points of ln(k/T) on 1/T, as the n ≥ 3 path and the CLI contract do.
    const eSlope = (Math.log(b.k / b.temperatureK) - Math.log(a.k / a.temperatureK)) / (1 / b.temperatureK - 1 / a.temperatureK);
    const eIntercept = Math.log(a.k / a.temperatureK) - eSlope / a.temperatureK;
    const dH = -eSlope * GAS_R;
    const dS = GAS_R * (eIntercept - LN_KB_OVER_H);
    warnings.push("Two temperatures only: the activation energy comes from the two points, with no uncertainty.");
    return {
      n: 2,
      method: "two-point",
      weighted: false,
      ea: { value: ea, se: null, ci95: null, unit: "J/mol" },
      lnA: { value: lnA, se: null },
      corrEaLnA: null,
      r2: null,
      dof: 0,
      eyring: { dH: { value: dH, se: null, unit: "J/mol" }, dS: { value: dS, se: null, unit: "J/(mol K)" } },
      temperatureRangeK: range,
      warnings,
    };
  }
  const weighted = points.every((p) => p.se != null);
  if (!weighted && points.some((p) => p.se != null)) warnings.push("Standard errors were given for some rate constants only: the fit is unweighted.");
  // Var(ln k) ≈ (se/k)², so the weights are (k/se)².
  const weights = weighted ? points.map((p) => (p.k / p.se!) ** 2) : undefined;
  const x = T.map((t) => 1 / t);
  const arr = fitLine(x, points.map((p) => Math.log(p.k)), { weights });
  const eyr = fitLine(x, points.map((p, i) => Math.log(p.k / T[i]!)), { weights });
  const tq = tQuantile(0.975, arr.dof);
  const ea = -arr.slope * GAS_R;
  const seEa = arr.seSlope * GAS_R;
  const corr = arr.covSlopeIntercept !== null && arr.seIntercept ? -arr.covSlopeIntercept / (arr.seSlope * arr.seIntercept) : null;
  const odd = outlyingTemperature(points, weights);
  if (odd) warnings.push(odd);
  return {
    n: points.length,
    method: "least-squares",
    weighted,
    ea: { value: ea, se: seEa, ci95: [ea - tq * seEa, ea + tq * seEa], unit: "J/mol" },
    lnA: { value: arr.intercept, se: arr.seIntercept, ci95: arr.seIntercept === null ? null : [arr.intercept - tq * arr.seIntercept, arr.intercept + tq * arr.seIntercept] },
    corrEaLnA: corr,
    r2: arr.r2,
    dof: arr.dof,
    eyring: {
      dH: { value: -eyr.slope * GAS_R, se: eyr.seSlope * GAS_R, unit: "J/mol" },
      dS: { value: GAS_R * (eyr.intercept - LN_KB_OVER_H), se: eyr.seIntercept === null ? null : GAS_R * eyr.seIntercept, unit: "J/(mol K)" },
    },
    temperatureRangeK: range,
    warnings,
  };
}

/**
 * Externally studentized residuals of the Arrhenius line (each point against the line through the others; Belsley,
 * Kuh & Welsch 1980): a temperature is named when |t| exceeds the Bonferroni-corrected two-sided 5 % quantile of
 * t with n − 3 degrees of freedom. Needs four temperatures at least.
 */
export function outlyingTemperature(points: readonly RatePoint[], weights?: readonly number[]): string | null {
  const n = points.length;
  if (n < 4) return null;
  const limit = tQuantile(1 - 0.025 / n, n - 3);
  let worst: { i: number; z: number } | null = null;
  for (let i = 0; i < n; i++) {
    const keep = points.map((_, j) => j).filter((j) => j !== i);
    const w = weights ? keep.map((j) => weights[j]!) : undefined;
    const line = fitLine(keep.map((j) => 1 / points[j]!.temperatureK), keep.map((j) => Math.log(points[j]!.k)), { weights: w });
    const p = predictLine(line, 1 / points[i]!.temperatureK);
    // The point's own variance s²/w_i (relative weights: the others' s² carries the scale).
    const own = line.residualSd ** 2 / (weights ? weights[i]! : 1);
    const z = (Math.log(points[i]!.k) - p.value) / Math.sqrt(own + p.seMean ** 2);
    if (Number.isFinite(z) && (!worst || Math.abs(z) > Math.abs(worst.z))) worst = { i, z };
  }
  if (!worst || !(Math.abs(worst.z) > limit)) return null;
  const T = points[worst.i]!.temperatureK - KELVIN_OFFSET;
  return `The rate constant at ${T.toFixed(1)} °C lies off the line through the others (studentized residual ${worst.z.toFixed(1)}, beyond ±${limit.toFixed(1)}): check that run before relying on Ea.`;
}

/** ln k predicted at a temperature from the Arrhenius line, with the 95 % prediction interval of k. */
export function predictRateConstant(
  points: readonly RatePoint[],
  temperatureK: number,
): { k: number; ci95: [number, number]; pi95: [number, number]; extrapolated: boolean; warning: string | null } {
  checkPoints(points);
  if (points.length < 3) throw new TemperatureDataError("A prediction interval needs rate constants at three temperatures at least.");
  const weighted = points.every((p) => p.se != null);
  const line = fitLine(
    points.map((p) => 1 / p.temperatureK),
    points.map((p) => Math.log(p.k)),
    weighted ? { weights: points.map((p) => (p.k / p.se!) ** 2) } : {},
  );
  const pr = predictLine(line, 1 / temperatureK);
  const tq = line.tCrit;
  const T = points.map((p) => p.temperatureK);
  const lo = Math.min(...T),
    hi = Math.max(...T);
  const extrapolated = temperatureK < lo || temperatureK > hi;
  const warning = extrapolated
    ? `${(temperatureK - KELVIN_OFFSET).toFixed(1)} °C lies outside the measured ${(lo - KELVIN_OFFSET).toFixed(1)}–${(hi - KELVIN_OFFSET).toFixed(1)} °C: the prediction is an extrapolation and assumes the mechanism does not change. It is an estimate for qualified review, not a shelf-life or release decision.`
    : null;
  return {
    k: Math.exp(pr.value),
    ci95: [Math.exp(pr.value - tq * pr.seMean), Math.exp(pr.value + tq * pr.seMean)],
    pi95: [Math.exp(pr.value - tq * pr.sePrediction), Math.exp(pr.value + tq * pr.sePrediction)],
    extrapolated,
    warning,
  };
}

/** Q10 = (k2/k1)^(10/(T2 − T1)). */
export function q10(a: RatePoint, b: RatePoint): number {
  return Math.pow(b.k / a.k, 10 / (b.temperatureK - a.temperatureK));
}

/** Mean kinetic temperature (K): (ΔH/R) / −ln(Σ tᵢ e^{−ΔH/(R Tᵢ)} / Σ tᵢ); ΔH/R = 10 000 K by default. */
export function meanKineticTemperature(intervals: ReadonlyArray<{ temperatureK: number; duration: number }>, dHOverR = 10_000): number {
  let num = 0,
    den = 0;
  for (const { temperatureK, duration } of intervals) {
    num += duration * Math.exp(-dHOverR / temperatureK);
    den += duration;
  }
  return dHOverR / -Math.log(num / den);
}

/** kB·T/h, the Eyring frequency factor (s⁻¹). */
export function eyringFrequency(temperatureK: number): number {
  return (BOLTZMANN_KB * temperatureK) / PLANCK_H;
}

/** The Arrhenius straight line itself (ln k on 1/T, weighted as in `arrhenius`), for bands and residual plots. */
export function arrheniusLine(points: readonly RatePoint[]) {
  checkPoints(points);
  const weighted = points.every((p) => p.se != null);
  return fitLine(
    points.map((p) => 1 / p.temperatureK),
    points.map((p) => Math.log(p.k)),
    weighted ? { weights: points.map((p) => (p.k / p.se!) ** 2) } : {},
  );
}

/** The line's 95 % confidence band on ln k at the given temperatures (K). */
export function arrheniusBand(points: readonly RatePoint[], temperaturesK: readonly number[]): Array<{ temperatureK: number; lnK: number; low: number; high: number }> {
  const line = arrheniusLine(points);
  return temperaturesK.map((T) => {
    const p = predictLine(line, 1 / T);
    return { temperatureK: T, lnK: p.value, low: p.value - line.tCrit * p.seMean, high: p.value + line.tCrit * p.seMean };
  });
}

/**
 * The Eyring line's 95 % confidence band: the same weighted regression as Arrhenius, on ln(k/T) (k/T keeps k's relative
 * SE, so the weights are the same).
 */
export function eyringBand(points: readonly RatePoint[], temperaturesK: readonly number[]): Array<{ temperatureK: number; lnKOverT: number; low: number; high: number }> {
  const shifted = points.map((p) => ({ temperatureK: p.temperatureK, k: p.k / p.temperatureK, se: p.se == null ? null : p.se / p.temperatureK }));
  return arrheniusBand(shifted, temperaturesK).map((b) => ({ temperatureK: b.temperatureK, lnKOverT: b.lnK, low: b.low, high: b.high }));
}

/** ln(k/T) on the Eyring line at a temperature (K): ln(kB/h) + ΔS‡/R − ΔH‡/(R·T), for plots and reports. */
export function eyringLine(eyring: { dH: { value: number }; dS: { value: number } }, temperatureK: number): number {
  return LN_KB_OVER_H + eyring.dS.value / GAS_R - eyring.dH.value / (GAS_R * temperatureK);
}
