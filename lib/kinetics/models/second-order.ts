// Second order (equal reactants, or one reactant with itself): y = a0 / (1 + a0·k·t), i.e. 1/y = 1/a0 + k·t.
import { nonlinearDescriptor } from "./nonlinear";
import type { NonlinearModel } from "./types";

const model: NonlinearModel = {
  params: ["a0", "k"],
  lower: { k: 0 },
  originDependent: ["a0"],
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
  toOrigin(v, tref) {
    // 1/a0 = 1/a0' − k·tref
    const inv = 1 / v.a0! - v.k! * tref;
    const a0 = 1 / inv;
    const ok = inv > 0 === v.a0! > 0 && Number.isFinite(a0);
    return {
      values: { a0: ok ? a0 : null, k: v.k! },
      gradient: [
        [ok ? (a0 * a0) / (v.a0! * v.a0!) : 0, ok ? a0 * a0 * tref : 0],
        [0, 1],
      ],
      notes: ok
        ? []
        : [`a0 is the value at t = 0, ${tref.toPrecision(4)} s before the first reading: the second-order curve has no finite value there, so it is not given. At the first reading the fitted value is ${v.a0!.toPrecision(6)}.`],
    };
  },
};

export const secondOrder = nonlinearDescriptor(
  {
    id: "second-order",
    label: "Second order",
    equation: "y = a0 / (1 + a0·k·t)",
    params: [
      { name: "a0", label: "value at t = 0", dimension: "y" },
      { name: "k", label: "rate constant", dimension: "1/(y t)" },
    ],
    comparable: true,
    kScalesWithConcentration: true,
    firstOrderK: false,
    needsInterval: false,
  },
  model,
);
