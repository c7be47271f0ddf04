// Kinetics quantities: half-life and t90 with their SEs, instantaneous rates, k_obs → k2, Beer–Lambert and %T with
// blank and dilution, and calibration curves with LOD/LOQ (ICH Q2(R2)) and inverse prediction.
import { extraSumOfSquaresF } from "./diagnostics";
import { householderQR } from "./linalg";
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
/** Weights of a calibration line: none, or 1/x or 1/x² for variance growing with concentration (x > 0 needed). */
export type CalibrationWeighting = "none" | "1/x" | "1/x2";

export interface CalibrationOptions {
  sigma?: SigmaSource;
  blankSd?: number;
  throughOrigin?: boolean;
  weighting?: CalibrationWeighting;
}

export interface LinearityCheck {
  /** Extra-sum-of-squares F test of a quadratic term (Mandel's fitting test); null with too few levels. */
  quadratic: { f: number; p: number } | null;
  /** Residuals divided by the residual SD (weighted residuals for a weighted line). */
  standardized: number[];
  /** Points whose standardized residual exceeds 2.5 in size (1-based, in the order given). */
  outliers: number[];
  linear: boolean;
}

export interface Calibration {
  slope: number;
  seSlope: number;
  intercept: number;
  seIntercept: number | null;
  residualSd: number;
  r2: number;
  n: number;
  levels: number;
  range: [number, number];
  throughOrigin: boolean;
  weighting: CalibrationWeighting;
  sigma: number;
  sigmaSource: SigmaSource;
  lod: number;
  loq: number;
  linearity: LinearityCheck;
  fit: LineFit;
  warnings: string[];
}

/**
 * OLS (or weighted, or through the origin) of signal on concentration; LOD = 3.3σ/S, LOQ = 10σ/S with σ chosen and
 * recorded (ICH Q2(R2)), and a linearity check: a quadratic term's F test and standardized residuals.
 */
export function calibrate(conc: ArrayLike<number>, signal: ArrayLike<number>, opts: CalibrationOptions = {}): Calibration {
  const weighting = opts.weighting ?? "none";
  const x = Array.from(conc);
  let weights: number[] | undefined;
  if (weighting !== "none") {
    if (x.some((v) => !(v > 0))) throw new RangeError(`Weighting by ${weighting} needs every concentration above zero; drop the blank standards or fit unweighted.`);
    weights = x.map((v) => (weighting === "1/x" ? 1 / v : 1 / (v * v)));
  }
  const fit = fitLine(conc, signal, { throughOrigin: opts.throughOrigin, weights });
  const source = opts.sigma ?? "residual";
  if (source === "intercept" && fit.seIntercept === null) throw new RangeError("σ from the intercept's SE needs a line with an intercept (not through the origin).");
  const sigma = source === "residual" ? fit.residualSd : source === "intercept" ? fit.seIntercept! : opts.blankSd;
  if (sigma === undefined || !(sigma >= 0)) throw new RangeError("σ from blanks needs the blanks' standard deviation (blankSd).");
  const levels = new Set(x).size;
  const warnings: string[] = [];
  if (levels < 5) warnings.push("Fewer than 5 concentration levels: ICH Q2(R2) asks for at least 5 for linearity.");
  if (weighting !== "none" && source === "residual")
    warnings.push("With a weighted line the residual SD is in weighted units; LOD/LOQ from it describe the low end only roughly. Consider σ from blanks.");
  const sw = weights ?? x.map(() => 1);
  const standardized = fit.residuals.map((r, i) => (fit.residualSd > 0 ? (r * Math.sqrt(sw[i]!)) / fit.residualSd : 0));
  const outliers = standardized.flatMap((z, i) => (Math.abs(z) > 2.5 ? [i + 1] : []));
  const quadratic = quadraticTerm(x, Array.from(signal), sw, Boolean(opts.throughOrigin), fit);
  const linear = (quadratic === null || quadratic.p >= 0.05) && outliers.length === 0;
  if (quadratic && quadratic.p < 0.05) warnings.push(`A quadratic term is significant (Mandel's test p = ${quadratic.p.toPrecision(2)}): the response curves; narrow the range to its linear part.`);
  if (outliers.length) warnings.push(`Standard(s) ${outliers.join(", ")} lie more than 2.5 residual SDs from the line.`);
  return {
    slope: fit.slope,
    seSlope: fit.seSlope,
    intercept: fit.intercept,
    seIntercept: fit.seIntercept,
    residualSd: fit.residualSd,
    r2: fit.r2,
    n: fit.n,
    levels,
    range: [Math.min(...x), Math.max(...x)],
    throughOrigin: Boolean(opts.throughOrigin),
    weighting,
    sigma,
    sigmaSource: source,
    lod: (3.3 * sigma) / fit.slope,
    loq: (10 * sigma) / fit.slope,
    linearity: { quadratic, standardized, outliers, linear },
    fit,
    warnings,
  };
}

/** SSR of y = b0 + b1·x + b2·x² (weighted, by Householder QR on x scaled to [−1, 1]) against the straight line. */
function quadraticTerm(x: number[], y: number[], w: number[], throughOrigin: boolean, line: LineFit): { f: number; p: number } | null {
  const n = x.length;
  const p = throughOrigin ? 2 : 3;
  if (new Set(x).size < p + 1 || n <= p) return null;
  const scale = Math.max(...x.map(Math.abs)) || 1;
  const a = new Float64Array(n * p);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const sw = Math.sqrt(w[i]!);
    const u = x[i]! / scale;
    const cols = throughOrigin ? [u, u * u] : [1, u, u * u];
    cols.forEach((v, j) => (a[j * n + i] = v * sw));
    b[i] = y[i]! * sw;
  }
  householderQR(a, n, p, [b]);
  let ssr = 0;
  for (let i = p; i < n; i++) ssr += b[i]! * b[i]!;
  const test = extraSumOfSquaresF({ ssr: line.ssr, dof: line.dof }, { ssr, dof: n - p });
  return test ? { f: test.f, p: test.p } : null;
}

/**
 * x0 = (ȳ0 − b0)/b1 from m replicate readings, with s_x0 = (s/b1)·√(1/m + 1/n + (ȳ0 − ȳ)²/(b1²·Sxx)) for an unweighted
 * line (Miller & Miller). For a weighted line or one through the origin the same delta-method form uses the line's own
 * weighted mean, Σw and Sxx (the new readings carry the data's mean weight).
 */
export function inversePredict(cal: Calibration, readings: ArrayLike<number>): { value: number; se: number } {
  const m = readings.length;
  let y0 = 0;
  for (let i = 0; i < m; i++) y0 += readings[i]!;
  y0 /= m;
  const { fit } = cal;
  const value = (y0 - fit.intercept) / fit.slope;
  const meanW = fit.sumW / fit.n;
  const interceptTerm = fit.seIntercept === null ? 0 : 1 / fit.sumW;
  const ybar = fit.intercept + fit.slope * fit.xMean;
  const s = fit.residualSd;
  const se = (s / Math.abs(fit.slope)) * Math.sqrt(1 / (m * meanW) + interceptTerm + (y0 - ybar) ** 2 / (fit.slope ** 2 * fit.sxx));
  return { value, se };
}
