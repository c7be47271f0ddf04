// Two exponentials: y = c + a1·exp(−k1·t) + a2·exp(−k2·t), two parallel or consecutive first-order phases.
import { nonlinearDescriptor } from "./nonlinear";
import { firstOrderGridStart } from "./starts";
import { outOfRangeAtZero, type NonlinearModel } from "./types";

const LABELS = "k1 and k2 can be exchanged (with a1 and a2) without changing the fit: they are labelled so that k1 > k2.";

const model: NonlinearModel = {
  params: ["a1", "k1", "a2", "k2", "c"],
  lower: { k1: 0, k2: 0 },
  originDependent: ["a1", "a2"],
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
    if (v.k1! < v.k2!) {
      [v.k1, v.k2] = [v.k2!, v.k1!];
      [v.a1, v.a2] = [v.a2!, v.a1!];
    }
    return LABELS;
  },
  check(r) {
    const p = (n: string) => r.parameters.find((q) => q.name === n)!;
    const [a1, k1, a2, k2] = [p("a1"), p("k1"), p("a2"), p("k2")];
    if ([a1, k1, a2, k2].some((q) => q.fixed)) return null;
    const apart = k1.se !== null && k2.se !== null && Math.abs(k1.value! - k2.value!) > 2 * Math.hypot(k1.se, k2.se);
    const both = [a1, a2].every((q) => q.se !== null && Math.abs(q.value!) > 2 * q.se);
    if (apart && both) return null;
    return `The two phases cannot be told apart by these data (${apart ? "" : "k1 and k2 are within two standard errors of each other"}${!apart && !both ? "; " : ""}${both ? "" : "an amplitude is within two standard errors of zero"}): a single exponential describes them as well. Prefer the first-order fit.`;
  },
  toOrigin(v, tref) {
    // a_i = a_i'·exp(k_i·tref)
    const E1 = Math.exp(v.k1! * tref),
      E2 = Math.exp(v.k2! * tref);
    const a1 = v.a1! * E1,
      a2 = v.a2! * E2;
    const notes: string[] = [];
    for (const [name, val, at] of [["a1", a1, v.a1!], ["a2", a2, v.a2!]] as const)
      if (!Number.isFinite(val))
        notes.push(outOfRangeAtZero(name, tref, at));
    const f = (g: number) => (Number.isFinite(g) ? g : 0);
    return {
      values: { a1: Number.isFinite(a1) ? a1 : null, k1: v.k1!, a2: Number.isFinite(a2) ? a2 : null, k2: v.k2!, c: v.c! },
      gradient: [
        [f(E1), f(v.a1! * tref * E1), 0, 0, 0],
        [0, 1, 0, 0, 0],
        [0, 0, f(E2), f(v.a2! * tref * E2), 0],
        [0, 0, 0, 1, 0],
        [0, 0, 0, 0, 1],
      ],
      notes,
    };
  },
};

export const biexponential = nonlinearDescriptor(
  {
    id: "biexponential",
    label: "Two exponentials",
    equation: "y = c + a1·exp(−k1·t) + a2·exp(−k2·t)",
    params: [
      { name: "a1", label: "amplitude of the fast phase", dimension: "y" },
      { name: "k1", label: "rate constant of the fast phase", dimension: "1/t" },
      { name: "a2", label: "amplitude of the slow phase", dimension: "y" },
      { name: "k2", label: "rate constant of the slow phase", dimension: "1/t" },
      { name: "c", label: "end value", dimension: "y" },
    ],
    comparable: true,
    kScalesWithConcentration: false,
    firstOrderK: false,
    needsInterval: false,
  },
  model,
);
