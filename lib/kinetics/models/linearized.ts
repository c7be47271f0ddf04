// Linearized first order: least squares of ln|y − A∞| on t, with A∞ given or estimated by the nonlinear fit.
import { linearizedFirstOrder } from "../linearized";
import { failedFit } from "../nls";
import { firstOrder } from "./first-order";
import type { ModelDescriptor } from "./types";

export const linearized: ModelDescriptor = {
  id: "linearized",
  label: "Linearized first order",
  family: "straight-line",
  equation: "ln|y − A∞| = ln|a0 − A∞| − k·t",
  params: [
    { name: "k", label: "rate constant", dimension: "1/t" },
    { name: "a0", label: "value at t = 0", dimension: "y" },
    { name: "ainf", label: "end value A∞ (given or estimated, not fitted here)", dimension: "y" },
  ],
  comparable: false,
  kScalesWithConcentration: false,
  firstOrderK: true,
  needsInterval: false,
  curve: null,
  fit(t, y, spec) {
    const fixed = spec.fixed ?? {};
    if ("ainf" in fixed) return linearizedFirstOrder(t, y, { ainf: fixed.ainf!, ainfSource: "fixed at the given value", weighted: spec.logWeights });
    const nl = firstOrder.fit(t, y, { weighting: spec.weighting });
    const ainf = nl.parameters.find((p) => p.name === "ainf")?.value;
    if (!nl.converged || ainf == null)
      return failedFit("linearized", ["k", "a0", "ainf"], t.length, `No fit: ainf was not given (--fix ainf=V) and could not be estimated: ${nl.message}`);
    const r = linearizedFirstOrder(t, y, { ainf, ainfSource: `estimated by the nonlinear first-order fit (${ainf.toPrecision(6)}), not measured`, weighted: spec.logWeights });
    // Taken from the nonlinear fit, A∞ is held here but was not given by the analyst.
    r.parameters = r.parameters.map((p) => (p.name === "ainf" ? { ...p, fixed: false, held_from: "first-order" } : p));
    return r;
  },
};
