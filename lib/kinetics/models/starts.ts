// Start rules and shared pieces of the exponential models.

const GRID_SAMPLE = 256;

/** Grid search over k with the two linear parameters solved exactly (variable projection): robust starts for decays
 * and rises alike, with no need for a guess of A∞. */
export function firstOrderGridStart(
  t: Float64Array,
  y: Float64Array,
  fixed: Record<string, number> = {},
): { a0: number; ainf: number; k: number } | null {
  // The grid only needs the curve's shape: on long series a strided sample of at most GRID_SAMPLE points gives the
  // same start at a fraction of the cost (65 exponentials per point otherwise).
  if (t.length > GRID_SAMPLE) {
    const stride = Math.ceil(t.length / GRID_SAMPLE);
    const ts: number[] = [],
      ys: number[] = [];
    for (let i = 0; i < t.length; i += stride) {
      ts.push(t[i]!);
      ys.push(y[i]!);
    }
    ts.push(t[t.length - 1]!);
    ys.push(y[y.length - 1]!);
    return firstOrderGridStart(Float64Array.from(ts), Float64Array.from(ys), fixed);
  }
  const n = t.length;
  let tmin = Infinity,
    tmax = -Infinity;
  for (let i = 0; i < n; i++) {
    tmin = Math.min(tmin, t[i]!);
    tmax = Math.max(tmax, t[i]!);
  }
  const span = tmax - tmin;
  if (!(span > 0)) return null;
  const e = new Float64Array(n);
  let best: { ssr: number; a0: number; ainf: number; k: number } | null = null;
  const steps = 64;
  for (let s = 0; s <= steps; s++) {
    const k = (0.02 / span) * Math.pow(2000 / 0.02, s / steps);
    if (fixed.k !== undefined && s > 0) break;
    const kk = fixed.k ?? k;
    for (let i = 0; i < n; i++) e[i] = Math.exp(-kk * (t[i]! - tmin));
    // y = ainf + b·e  (b = (a0 − ainf)·exp(−k·tmin))
    let ainf: number, b: number;
    if (fixed.ainf !== undefined) {
      ainf = fixed.ainf;
      let num = 0,
        den = 0;
      for (let i = 0; i < n; i++) {
        num += e[i]! * (y[i]! - ainf);
        den += e[i]! * e[i]!;
      }
      b = num / den;
    } else {
      let me = 0,
        my = 0;
      for (let i = 0; i < n; i++) {
        me += e[i]!;
        my += y[i]!;
      }
      me /= n;
      my /= n;
      let sxy = 0,
        sxx = 0;
      for (let i = 0; i < n; i++) {
        sxy += (e[i]! - me) * (y[i]! - my);
        sxx += (e[i]! - me) ** 2;
      }
      if (!(sxx > 0)) continue;
      b = sxy / sxx;
      ainf = my - b * me;
    }
    let ssr = 0;
    for (let i = 0; i < n; i++) ssr += (y[i]! - ainf - b * e[i]!) ** 2;
    const a0 = ainf + b * Math.exp(kk * tmin);
    if (Number.isFinite(ssr) && Number.isFinite(a0) && (!best || ssr < best.ssr)) best = { ssr, a0, ainf, k: kk };
  }
  if (!best) return null;
  return { a0: fixed.a0 ?? best.a0, ainf: best.ainf, k: best.k };
}

// exp(−k·t) for the last k seen on each time array: the Jacobian is always asked for at the point whose residuals
// were just evaluated, so one exponential per point serves both.
const expCache = new WeakMap<Float64Array, { k: number; e: Float64Array }>();
export function decayFactors(t: Float64Array, k: number): Float64Array {
  let c = expCache.get(t);
  if (c && c.k === k) return c.e;
  if (!c) {
    c = { k: NaN, e: new Float64Array(t.length) };
    expCache.set(t, c);
  }
  const e = c.e;
  for (let i = 0; i < t.length; i++) e[i] = Math.exp(-k * t[i]!);
  c.k = k;
  return e;
}

