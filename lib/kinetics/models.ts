// Built-in kinetic models: each a function of t with its analytic Jacobian, parameter names, bounds and a start rule.
import { fitLine } from "./regression";
import type { ModelFunction } from "./types";

export interface BuiltInModel extends ModelFunction {
  name: string;
  description: string;
  lower: Record<string, number>;
  /** Start values from the data (and alternatives to try when the first start fails). */
  starts(t: Float64Array, y: Float64Array, fixed: Record<string, number>): Array<Record<string, number>>;
  /** Optional tidy-up after the fit (e.g. ordering exchangeable parameters); returns a warning when it changed labels. */
  normalise?(values: Record<string, number>): string | null;
}

const GRID_SAMPLE = 2000;

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
function decayFactors(t: Float64Array, k: number): Float64Array {
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

const firstOrder: BuiltInModel = {
  name: "first-order",
  description: "y = ainf + (a0 − ainf)·exp(−k·t): decay or rise to a plateau; k per unit of t",
  params: ["a0", "ainf", "k"],
  lower: { k: 0 },
  evaluate(t, p, out) {
    const [a0, ainf, k] = [p[0]!, p[1]!, p[2]!];
    const e = decayFactors(t, k);
    const amp = a0 - ainf;
    for (let i = 0; i < t.length; i++) out[i] = ainf + amp * e[i]!;
  },
  jacobian(t, p, J) {
    const [a0, ainf, k] = [p[0]!, p[1]!, p[2]!];
    const n = t.length;
    const e = decayFactors(t, k);
    const amp = a0 - ainf;
    for (let i = 0; i < n; i++) {
      const ei = e[i]!;
      J[i] = ei;
      J[n + i] = 1 - ei;
      J[2 * n + i] = -amp * t[i]! * ei;
    }
  },
  starts(t, y, fixed) {
    const g = firstOrderGridStart(t, y, fixed);
    if (!g) return [{ a0: y[0]!, ainf: y[y.length - 1]!, k: 1 }];
    return [g, { ...g, k: g.k * 3 }, { ...g, k: g.k / 3 }];
  },
};

const zeroOrder: BuiltInModel = {
  name: "zero-order",
  description: "y = a0 − k·t: constant rate",
  params: ["a0", "k"],
  lower: {},
  evaluate(t, p, out) {
    for (let i = 0; i < t.length; i++) out[i] = p[0]! - p[1]! * t[i]!;
  },
  jacobian(t, _p, J) {
    const n = t.length;
    for (let i = 0; i < n; i++) {
      J[i] = 1;
      J[n + i] = -t[i]!;
    }
  },
  starts(t, y) {
    const l = fitLine(t, y);
    return [{ a0: l.intercept, k: -l.slope }];
  },
};

const secondOrder: BuiltInModel = {
  name: "second-order",
  description: "y = a0 / (1 + a0·k·t), i.e. 1/y = 1/a0 + k·t: equal reactants, or one reactant with itself",
  params: ["a0", "k"],
  lower: { k: 0 },
  evaluate(t, p, out) {
    const [a0, k] = [p[0]!, p[1]!];
    for (let i = 0; i < t.length; i++) out[i] = a0 / (1 + a0 * k * t[i]!);
  },
  jacobian(t, p, J) {
    const [a0, k] = [p[0]!, p[1]!];
    const n = t.length;
    for (let i = 0; i < n; i++) {
      const d = 1 + a0 * k * t[i]!;
      J[i] = 1 / (d * d);
      J[n + i] = (-a0 * a0 * t[i]!) / (d * d);
    }
  },
  starts(t, y) {
    // a0 from the earliest reading; k from 1/y − 1/a0 = k·t through the origin (the free-intercept line can put
    // a0 below zero when the data are far from second order).
    let i0 = 0;
    for (let i = 1; i < t.length; i++) if (t[i]! < t[i0]!) i0 = i;
    const a0 = y[i0]!;
    let num = 0,
      den = 0;
    for (let i = 0; i < t.length; i++)
      if (y[i]! > 0) {
        const dt = t[i]! - t[i0]!;
        num += dt * (1 / y[i]! - 1 / a0);
        den += dt * dt;
      }
    const k = den > 0 && num > 0 ? num / den : 1 / Math.max(1e-12, (t[t.length - 1]! - t[i0]!) * Math.abs(a0));
    return [{ a0, k }, { a0: a0 * 1.5, k }, { a0, k: k * 5 }];
  },
};

const biexponential: BuiltInModel = {
  name: "biexponential",
  description: "y = c + a1·exp(−k1·t) + a2·exp(−k2·t): two parallel or consecutive first-order phases (labelled k1 > k2)",
  params: ["a1", "k1", "a2", "k2", "c"],
  lower: { k1: 0, k2: 0 },
  evaluate(t, p, out) {
    const [a1, k1, a2, k2, c] = [p[0]!, p[1]!, p[2]!, p[3]!, p[4]!];
    for (let i = 0; i < t.length; i++) out[i] = c + a1 * Math.exp(-k1 * t[i]!) + a2 * Math.exp(-k2 * t[i]!);
  },
  jacobian(t, p, J) {
    const [a1, k1, a2, k2] = [p[0]!, p[1]!, p[2]!, p[3]!];
    const n = t.length;
    for (let i = 0; i < n; i++) {
      const e1 = Math.exp(-k1 * t[i]!),
        e2 = Math.exp(-k2 * t[i]!);
      J[i] = e1;
      J[n + i] = -a1 * t[i]! * e1;
      J[2 * n + i] = e2;
      J[3 * n + i] = -a2 * t[i]! * e2;
      J[4 * n + i] = 1;
    }
  },
  starts(t, y) {
    const g = firstOrderGridStart(t, y);
    if (!g) return [{ a1: y[0]! / 2, k1: 2, a2: y[0]! / 2, k2: 0.5, c: 0 }];
    const amp = g.a0 - g.ainf;
    return [3, 10, 30].map((f) => ({ a1: amp / 2, k1: g.k * f, a2: amp / 2, k2: g.k / f, c: g.ainf }));
  },
  normalise(v) {
    if (v.k1! >= v.k2!) return "k1 and k2 can be exchanged (with a1 and a2) without changing the fit: they are labelled so that k1 > k2.";
    [v.k1, v.k2] = [v.k2!, v.k1!];
    [v.a1, v.a2] = [v.a2!, v.a1!];
    return "k1 and k2 can be exchanged (with a1 and a2) without changing the fit: they are labelled so that k1 > k2.";
  },
};

export const BUILT_IN_MODELS: Record<string, BuiltInModel> = {
  [firstOrder.name]: firstOrder,
  [zeroOrder.name]: zeroOrder,
  [secondOrder.name]: secondOrder,
  [biexponential.name]: biexponential,
};
