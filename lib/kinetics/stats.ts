// Statistics helpers: compensated sums, the t and normal distributions (jstat), small summaries.
import jStat from "jstat";

/** Neumaier's compensated sum: keeps digits that a plain loop loses on long or wide-ranging arrays. */
export function fsum(values: ArrayLike<number>): number {
  let sum = 0,
    c = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    const t = sum + v;
    c += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  return sum + c;
}

export function mean(values: ArrayLike<number>): number {
  return fsum(values) / values.length;
}

/** Two-sided quantile of Student's t: t(1 - alpha/2, dof). */
export function tQuantile(p: number, dof: number): number {
  if (!(dof > 0)) return NaN;
  return jStat.studentt.inv(p, dof);
}

export function tCdf(x: number, dof: number): number {
  return jStat.studentt.cdf(x, dof);
}

export function normalCdf(z: number): number {
  return jStat.normal.cdf(z, 0, 1);
}

export function fCdf(x: number, d1: number, d2: number): number {
  return jStat.centralF.cdf(x, d1, d2);
}

export function ssq(values: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < values.length; i++) s += values[i]! * values[i]!;
  return s;
}
