// First order: y = ainf + (a0 − ainf)·exp(−k·t), decay or rise to a plateau.
import { nonlinearDescriptor } from "./nonlinear";
import { decayFactors, firstOrderGridStart } from "./starts";
import { outOfRangeAtZero, type NonlinearModel } from "./types";

export const firstOrderFunction: NonlinearModel = {
  params: ["a0", "ainf", "k"],
  lower: { k: 0 },
  originDependent: ["a0"],
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
  toOrigin(v, tref) {
    // a0 = ainf + (a0' − ainf)·exp(k·tref)
    const E = Math.exp(v.k! * tref);
    const amp = v.a0! - v.ainf!;
    const a0 = v.ainf! + amp * E;
    const ok = Number.isFinite(a0);
    return {
      values: { a0: ok ? a0 : null, ainf: v.ainf!, k: v.k! },
      gradient: [
        [E, 1 - E, amp * tref * E],
        [0, 1, 0],
        [0, 0, 1],
      ].map((row) => row.map((g) => (Number.isFinite(g) ? g : 0))),
      notes: ok
        ? []
        : [outOfRangeAtZero("a0", tref, v.a0!)],
    };
  },
};

export const firstOrder = nonlinearDescriptor(
  {
    id: "first-order",
    label: "Nonlinear first order",
    equation: "y = A∞ + (a0 − A∞)·exp(−k·t)",
    params: [
      { name: "a0", label: "value at t = 0", dimension: "y" },
      { name: "ainf", label: "end value A∞", dimension: "y" },
      { name: "k", label: "rate constant", dimension: "1/t" },
    ],
    comparable: true,
    kScalesWithConcentration: false,
    firstOrderK: true,
    needsInterval: false,
  },
  firstOrderFunction,
);
