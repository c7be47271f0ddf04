// An own formula: y as an expression of t in standard notation; every other free name is a parameter (units unknown).
import { compileFormula, FormulaError } from "../formula";
import { fitNonlinear } from "../nls";
import { FitSpecError } from "./nonlinear";
import { ranOff, type ModelDescriptor } from "./types";

/** Below this r², a fit made from default start values is said to be poor. */
const POOR_R2 = 0.9;
/** A formula parameter this many times the data's scale (largest value, inverse reading spacing, 1) has run away. */
const RUNAWAY_FACTOR = 1e6;

export const formulaModel: ModelDescriptor = {
  id: "formula",
  label: "Own formula",
  family: "formula",
  equation: "y = f(t) as written",
  params: [],
  comparable: true,
  kScalesWithConcentration: false,
  firstOrderK: false,
  needsInterval: false,
  curve: null,
  fit(t, y, spec) {
    const fixed = spec.fixed ?? {};
    let f;
    try {
      f = compileFormula(spec.formula ?? "");
    } catch (e) {
      if (e instanceof FormulaError) throw new FitSpecError(e.message);
      throw e;
    }
    for (const k of Object.keys(spec.start ?? {}))
      if (!f.params.includes(k)) throw new FitSpecError(`"${k}" is not a parameter of the formula (its parameters: ${f.params.join(", ")}).`);
    const missing = f.params.filter((p) => !(p in fixed) && !(p in (spec.start ?? {})));
    const start = { ...Object.fromEntries(missing.map((p) => [p, 1])), ...spec.start };
    const scale = (s: Record<string, number>, by: number) => Object.fromEntries(Object.entries(s).map(([k, v]) => [k, v * by]));
    const r = fitNonlinear("formula", f, t, y, { start, fixed, weighting: spec.weighting, alternativeStarts: [scale(start, 0.1), scale(start, 10)] });
    const out = { ...r, model: "formula", formula: f.expression };
    if (!r.converged) return out;
    const biggest = dataScale(t, y);
    const off = r.parameters.filter((p) => !p.fixed && p.value !== null && Math.abs(p.value) > RUNAWAY_FACTOR * biggest);
    if (off.length) {
      out.converged = false;
      out.message = `The fit did not settle: ${ranOff(off)}. Give start values near the expected ones or fix a parameter.`;
      out.parameters = out.parameters.map((p) => (p.fixed ? p : { ...p, value: null, se: null, ci95: null }));
      return out;
    }
    if (missing.length) {
      out.message += ` Start values of 1 were used for ${missing.join(", ")}.`;
      if (r.r2 !== null && r.r2 < POOR_R2)
        out.warnings = [...out.warnings, `A poor fit (r² ${r.r2.toFixed(3)}) from default start values (1 for ${missing.join(", ")}): the fit may have found a wrong minimum. Give start values near the expected ones.`];
    }
    return out;
  },
};

function dataScale(t: Float64Array, y: Float64Array): number {
  let s = 1;
  let tmin = Infinity,
    tmax = -Infinity;
  for (let i = 0; i < t.length; i++) {
    s = Math.max(s, Math.abs(y[i]!));
    tmin = Math.min(tmin, t[i]!);
    tmax = Math.max(tmax, t[i]!);
  }
  if (t.length > 1 && tmax > tmin) s = Math.max(s, t.length / (tmax - tmin));
  return s;
}
