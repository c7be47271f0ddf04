// Kinetics quantities: half-life and t90 with their SEs, instantaneous rates, k_obs → k2, Beer–Lambert and %T with
// blank and dilution, and calibration curves with LOD/LOQ (ICH Q2(R2)) and inverse prediction.
import { fitLine, type LineFit } from "./regression";

const LN2 = Math.LN2;
const LN_10_9 = Math.log(10 / 9);

/** First order: t½ = ln 2 / k, SE by the delta method (SE(t½) = t½ · SE(k)/k). */
export function halfLife(k: number, seK: number | null = null): { value: number; se: number | null } {
  const v = LN2 / k;
  return { value: v, se: seK === null ? null : (v * seK) / k };
}

/** First order: t90 = ln(10/9) / k, the time to lose 10 %. */
export function t90(k: number, seK: number | null = null): { value: number; se: number | null } {
  const v = LN_10_9 / k;
  return { value: v, se: seK === null ? null : (v * seK) / k };
}

/** −dy/dt of the first-order model at time t: k·(y(t) − y∞). */
export function firstOrderRate(p: { a0: number; ainf: number; k: number }, t: number): number {
  return p.k * (p.a0 - p.ainf) * Math.exp(-p.k * t);
}

/** −dy/dt from the data: the slope of a straight line through the readings within ±halfWidth of t. */
export function localTangentRate(t: ArrayLike<number>, y: ArrayLike<number>, at: number, halfWidth: number): { rate: number; se: number; points: number } {
  const xs: number[] = [],
    ys: number[] = [];
  for (let i = 0; i < t.length; i++)
    if (Math.abs(t[i]! - at) <= halfWidth) {
      xs.push(t[i]!);
      ys.push(y[i]!);
    }
  const l = fitLine(xs, ys);
  return { rate: -l.slope, se: l.seSlope, points: xs.length };
}

/** A = 2 − log10(%T). */
export function transmittanceToAbsorbance(percentT: number): number {
  return 2 - Math.log10(percentT);
}

/** c = (A − A_blank) / (ε·b) × dilution (mol/L for ε in L mol⁻¹ cm⁻¹ and b in cm). */
export function beerLambertConcentration(a: number, o: { epsilon: number; pathLengthCm: number; blank?: number; dilution?: number }): number {
  return ((a - (o.blank ?? 0)) / (o.epsilon * o.pathLengthCm)) * (o.dilution ?? 1);
}

/** Second-order rate constant from pseudo-first-order k_obs at several excess concentrations: the slope of k_obs on [B]0. */
export function secondOrderFromObserved(excess: ArrayLike<number>, kobs: ArrayLike<number>, opts: { throughOrigin?: boolean } = {}): { k2: number; se: number; intercept: number | null; seIntercept: number | null; fit: LineFit } {
  const fit = fitLine(excess, kobs, { throughOrigin: opts.throughOrigin });
  return { k2: fit.slope, se: fit.seSlope, intercept: opts.throughOrigin ? null : fit.intercept, seIntercept: fit.seIntercept, fit };
}

export type SigmaSource = "residual" | "intercept" | "blank";

export interface Calibration {
  slope: number;
  seSlope: number;
  intercept: number;
  seIntercept: number;
  residualSd: number;
  r2: number;
  n: number;
  sigma: number;
  sigmaSource: SigmaSource;
  lod: number;
  loq: number;
  fit: LineFit;
  warnings: string[];
}

/** OLS of signal on concentration; LOD = 3.3σ/S, LOQ = 10σ/S with σ chosen and recorded (ICH Q2(R2)). */
export function calibrate(conc: ArrayLike<number>, signal: ArrayLike<number>, opts: { sigma?: SigmaSource; blankSd?: number } = {}): Calibration {
  const fit = fitLine(conc, signal);
  const source = opts.sigma ?? "residual";
  const sigma = source === "residual" ? fit.residualSd : source === "intercept" ? fit.seIntercept! : opts.blankSd;
  if (sigma === undefined || !(sigma >= 0)) throw new RangeError("σ from blanks needs the blanks' standard deviation (blankSd).");
  const warnings: string[] = [];
  if (new Set(Array.from(conc)).size < 5) warnings.push("Fewer than 5 concentration levels: ICH Q2(R2) asks for at least 5 for linearity.");
  return {
    slope: fit.slope,
    seSlope: fit.seSlope,
    intercept: fit.intercept,
    seIntercept: fit.seIntercept!,
    residualSd: fit.residualSd,
    r2: fit.r2,
    n: fit.n,
    sigma,
    sigmaSource: source,
    lod: (3.3 * sigma) / fit.slope,
    loq: (10 * sigma) / fit.slope,
    fit,
    warnings,
  };
}

/** x0 = (ȳ0 − b0)/b1 from m replicate readings, with s_x0 = (s/b1)·√(1/m + 1/n + (ȳ0 − ȳ)²/(b1²·Sxx)). */
export function inversePredict(cal: Calibration, readings: ArrayLike<number>): { value: number; se: number } {
  const m = readings.length;
  let y0 = 0;
  for (let i = 0; i < m; i++) y0 += readings[i]!;
  y0 /= m;
  const { fit } = cal;
  const ybar = fit.intercept + fit.slope * fit.xMean;
  const value = (y0 - fit.intercept) / fit.slope;
  const se = (fit.residualSd / Math.abs(fit.slope)) * Math.sqrt(1 / m + 1 / fit.n + (y0 - ybar) ** 2 / (fit.slope ** 2 * fit.sxx));
  return { value, se };
}
