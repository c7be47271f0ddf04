// Straight-line least squares, ordinary or weighted, with or without intercept. Centred two-pass sums (never raw
// sums: x may be a Unix time stamp), compensated, returning the estimates with their standard errors and covariance.
import { fsum, tQuantile } from "./stats";

export interface LineFitOptions {
  /** Relative weights (covariance scaled by s²) or absolute σ (covariance not scaled). */
  weights?: ArrayLike<number>;
  sigma?: ArrayLike<number>;
  throughOrigin?: boolean;
}

export interface LineFit {
  n: number;
  dof: number;
  slope: number;
  intercept: number;
  seSlope: number;
  seIntercept: number | null;
  covSlopeIntercept: number | null;
  residualSd: number;
  r2: number;
  ssr: number;
  /** Weighted mean of x: the point the estimates pivot around. */
  xMean: number;
  /** Σw(x − x̄)²: needed for prediction intervals. */
  sxx: number;
  sumW: number;
  residuals: number[];
  tCrit: number;
  absoluteSigma: boolean;
}

export class RegressionError extends Error {
  override name = "RegressionError";
}

export function fitLine(xIn: ArrayLike<number>, yIn: ArrayLike<number>, opts: LineFitOptions = {}): LineFit {
  const n = xIn.length;
  if (yIn.length !== n) throw new RegressionError(`x and y differ in length (${n} and ${yIn.length}).`);
  const p = opts.throughOrigin ? 1 : 2;
  if (n <= p) throw new RegressionError(`A straight line needs at least ${p + 1} points for an uncertainty; got ${n}.`);
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = opts.sigma ? 1 / opts.sigma[i]! ** 2 : opts.weights ? opts.weights[i]! : 1;
    if (!(v >= 0) || !Number.isFinite(v)) throw new RegressionError(`The weight of point ${i + 1} is not a finite non-negative number.`);
    if (!Number.isFinite(xIn[i]!) || !Number.isFinite(yIn[i]!)) throw new RegressionError(`Point ${i + 1} is not a finite number.`);
    w[i] = v;
  }
  const x = Float64Array.from(xIn);
  const y = Float64Array.from(yIn);
  const sumW = fsum(w);
  const wx = x.map((v, i) => v * w[i]!);
  const wy = y.map((v, i) => v * w[i]!);
  // Means with a second correcting pass: the first pass's rounding matters when x is large (a time stamp).
  const refine = (m: number, v: Float64Array) => m + fsum(v.map((q, i) => w[i]! * (q - m))) / sumW;
  const xMean = opts.throughOrigin ? 0 : refine(fsum(wx) / sumW, x);
  const yMean = opts.throughOrigin ? 0 : refine(fsum(wy) / sumW, y);
  const dx = x.map((v) => v - xMean);
  const dy = y.map((v) => v - yMean);
  const sxx = fsum(dx.map((v, i) => w[i]! * v * v));
  const sxy = fsum(dx.map((v, i) => w[i]! * v * dy[i]!));
  if (!(sxx > 0)) throw new RegressionError("All x values are equal: the slope is undefined.");
  const slope = sxy / sxx;
  const intercept = yMean - slope * xMean;
  const residuals: number[] = new Array(n);
  // Centred residuals: intercept + slope·x cancels catastrophically when x is far from zero.
  for (let i = 0; i < n; i++) residuals[i] = dy[i]! - slope * dx[i]!;
  const ssr = fsum(residuals.map((r, i) => w[i]! * r * r));
  const dof = n - p;
  const absoluteSigma = Boolean(opts.sigma);
  const s2 = absoluteSigma ? 1 : ssr / dof;
  const varSlope = s2 / sxx;
  const seSlope = Math.sqrt(varSlope);
  let seIntercept: number | null = null;
  let cov: number | null = null;
  if (!opts.throughOrigin) {
    seIntercept = Math.sqrt(s2 * (1 / sumW + (xMean * xMean) / sxx));
    cov = -xMean * varSlope;
  }
  const syy = fsum(dy.map((v, i) => w[i]! * v * v));
  const r2 = opts.throughOrigin ? 1 - ssr / syy : syy > 0 ? 1 - ssr / syy : 1;
  return {
    n,
    dof,
    slope,
    intercept: opts.throughOrigin ? 0 : intercept,
    seSlope,
    seIntercept,
    covSlopeIntercept: cov,
    residualSd: Math.sqrt(ssr / dof),
    r2,
    ssr,
    xMean,
    sxx,
    sumW,
    residuals,
    tCrit: tQuantile(0.975, dof),
    absoluteSigma,
  };
}

/**
 * The line's value at x0 with the standard errors of the mean response and of a new observation. A new observation
 * is given the data's mean weight unless `newWeight` says otherwise (for an unweighted fit that weight is 1): with
 * weights like (k/SE)², "weight 1" would be a wildly noisier observation than any in the data.
 */
export function predictLine(fit: LineFit, x0: number, newWeight = fit.sumW / fit.n): { value: number; seMean: number; sePrediction: number } {
  const s2 = fit.absoluteSigma ? 1 : fit.ssr / fit.dof;
  const d = x0 - fit.xMean;
  const varMean = s2 * ((fit.seIntercept === null ? 0 : 1 / fit.sumW) + (d * d) / fit.sxx);
  return { value: fit.intercept + fit.slope * x0, seMean: Math.sqrt(varMean), sePrediction: Math.sqrt(varMean + s2 / newWeight) };
}
