// Residual diagnostics and model comparison: runs test (Wald–Wolfowitz), Durbin–Watson, AICc, Akaike weights,
// extra-sum-of-squares F test.
import { fCdf, normalCdf } from "./stats";

export interface RunsTest {
  runs: number;
  positives: number;
  negatives: number;
  expected: number;
  z: number | null;
  p: number | null;
}

/** Runs of residual signs; zeros are skipped. Expected runs 2·n1·n2/n + 1 (Wald–Wolfowitz). */
export function runsTest(residuals: ArrayLike<number>): RunsTest {
  let runs = 0,
    pos = 0,
    neg = 0,
    prev = 0;
  for (let i = 0; i < residuals.length; i++) {
    const s = Math.sign(residuals[i]!);
    if (s === 0) continue;
    if (s > 0) pos++;
    else neg++;
    if (s !== prev) runs++;
    prev = s;
  }
  const n = pos + neg;
  const expected = n > 0 ? (2 * pos * neg) / n + 1 : 0;
  const variance = n > 1 ? (2 * pos * neg * (2 * pos * neg - n)) / (n * n * (n - 1)) : 0;
  const z = variance > 0 ? (runs - expected) / Math.sqrt(variance) : null;
  return { runs, positives: pos, negatives: neg, expected, z, p: z === null ? null : 2 * (1 - normalCdf(Math.abs(z))) };
}

/** d = Σ(e_t − e_{t−1})² / Σ e_t²; about 2 when successive residuals are independent. */
export function durbinWatson(residuals: ArrayLike<number>): number | null {
  let num = 0,
    den = 0;
  for (let i = 0; i < residuals.length; i++) {
    const e = residuals[i]!;
    den += e * e;
    if (i > 0) num += (e - residuals[i - 1]!) ** 2;
  }
  return den > 0 ? num / den : null;
}

/** AICc = n ln(SSR/n) + 2K + 2K(K+1)/(n − K − 1); null where n − K − 1 ≤ 0 or SSR is 0. */
export function aicc(ssr: number, n: number, k: number): number | null {
  if (!(ssr > 0) || n - k - 1 <= 0) return null;
  return n * Math.log(ssr / n) + 2 * k + (2 * k * (k + 1)) / (n - k - 1);
}

/** Akaike weights from AICc values (null entries get weight null). */
export function akaikeWeights(values: ReadonlyArray<number | null>): Array<number | null> {
  const finite = values.filter((v): v is number => v !== null && Number.isFinite(v));
  if (finite.length === 0) return values.map(() => null);
  const best = Math.min(...finite);
  const rel = values.map((v) => (v === null || !Number.isFinite(v) ? null : Math.exp(-(v - best) / 2)));
  const sum = rel.reduce<number>((s, v) => s + (v ?? 0), 0);
  return rel.map((v) => (v === null ? null : v / sum));
}

export interface FTest {
  f: number;
  df1: number;
  df2: number;
  p: number;
}

/** Extra-sum-of-squares F test of a simpler model nested in a more complex one. */
export function extraSumOfSquaresF(simple: { ssr: number; dof: number }, complex: { ssr: number; dof: number }): FTest | null {
  const df1 = simple.dof - complex.dof;
  const df2 = complex.dof;
  if (df1 <= 0 || df2 <= 0 || !(complex.ssr > 0)) return null;
  const f = (simple.ssr - complex.ssr) / df1 / (complex.ssr / df2);
  return { f, df1, df2, p: 1 - fCdf(Math.max(f, 0), df1, df2) };
}

/**
 * Student's t of the quadratic term of y = b0 + b1·u + b2·u² by least squares (u = t scaled to [−1, 1], the quadratic
 * column centred): |t| below about 2 means the data show no curvature a curved model could fit. Null for fewer than
 * four points or no time span.
 */
export function curvatureT(t: ArrayLike<number>, y: ArrayLike<number>): number | null {
  const n = t.length;
  if (n < 4) return null;
  let tmin = Infinity,
    tmax = -Infinity;
  for (let i = 0; i < n; i++) {
    tmin = Math.min(tmin, t[i]!);
    tmax = Math.max(tmax, t[i]!);
  }
  const half = (tmax - tmin) / 2;
  if (!(half > 0)) return null;
  const mid = tmin + half;
  // Sums for the normal equations of [1, u, u² − q] in two passes over the data, no arrays (series may be long).
  let q = 0;
  for (let i = 0; i < n; i++) {
    const u = (t[i]! - mid) / half;
    q += u * u;
  }
  q /= n;
  const A = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  const g = [0, 0, 0];
  for (let i = 0; i < n; i++) {
    const u = (t[i]! - mid) / half;
    const x = [1, u, u * u - q];
    for (let a = 0; a < 3; a++) {
      g[a]! += x[a]! * y[i]!;
      for (let b = 0; b < 3; b++) A[a]![b]! += x[a]! * x[b]!;
    }
  }
  const inv = invert3(A);
  if (!inv) return null;
  const b = [0, 1, 2].map((a) => inv[a]![0]! * g[0]! + inv[a]![1]! * g[1]! + inv[a]![2]! * g[2]!);
  let ssr = 0;
  for (let i = 0; i < n; i++) {
    const u = (t[i]! - mid) / half;
    ssr += (y[i]! - b[0]! - b[1]! * u - b[2]! * (u * u - q)) ** 2;
  }
  const s2 = ssr / (n - 3);
  const se = Math.sqrt(s2 * inv[2]![2]!);
  if (!(se > 0)) return b[2] === 0 ? 0 : null;
  return b[2]! / se;
}

function invert3(m: number[][]): number[][] | null {
  const [a, b, c] = m[0]!,
    [d, e, f] = m[1]!,
    [g, h, k] = m[2]!;
  const A = e! * k! - f! * h!,
    B = -(d! * k! - f! * g!),
    C = d! * h! - e! * g!;
  const det = a! * A + b! * B + c! * C;
  if (!(Math.abs(det) > 0) || !Number.isFinite(det)) return null;
  return [
    [A / det, -(b! * k! - c! * h!) / det, (b! * f! - c! * e!) / det],
    [B / det, (a! * k! - c! * g!) / det, -(a! * f! - c! * d!) / det],
    [C / det, -(a! * h! - b! * g!) / det, (a! * e! - b! * d!) / det],
  ];
}
