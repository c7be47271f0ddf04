// Zero order: y = a0 − k·t, a constant rate.
import { fitLine } from "../regression";
import { nonlinearDescriptor } from "./nonlinear";
import type { NonlinearModel } from "./types";

const model: NonlinearModel = {
  params: ["a0", "k"],
  lower: {},
  originDependent: ["a0"],
  straight: true,
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
  toOrigin(v, tref) {
    return {
      values: { a0: v.a0! + v.k! * tref, k: v.k! },
      gradient: [
        [1, tref],
        [0, 1],
      ],
      notes: [],
    };
  },
};

export const zeroOrder = nonlinearDescriptor(
  {
    id: "zero-order",
    label: "Zero order",
    equation: "y = a0 − k·t",
    params: [
      { name: "a0", label: "value at t = 0", dimension: "y" },
      { name: "k", label: "rate", dimension: "y/t" },
    ],
    comparable: true,
    kScalesWithConcentration: true,
    firstOrderK: false,
    needsInterval: false,
  },
  model,
);
