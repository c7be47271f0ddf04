// The engine's one entry point for a kinetic fit of one series: built-in models, straight-line methods and user formulas.
import { compileFormula, FormulaError } from "./formula";
import { guggenheim, kezdySwinbourne, linearizedFirstOrder } from "./linearized";
import { BUILT_IN_MODELS } from "./models";
import { asFloat64, failedFit, fitNonlinear } from "./nls";
import type { FitResult, Weighting } from "./types";

export const MODEL_NAMES = ["first-order", "linearized", "guggenheim", "kezdy-swinbourne", "zero-order", "second-order", "biexponential"] as const;
export type ModelName = (typeof MODEL_NAMES)[number];

export interface FitSpec {
  model?: string;
  formula?: string;
  fixed?: Record<string, number>;
  start?: Record<string, number>;
  /** Seconds, for Guggenheim and Kezdy–Swinbourne. */
  interval?: number;
  weighting?: Weighting;
  /** Linearized fit: weight by (y − A∞)². */
  logWeights?: boolean;
}

/** Built-in models on series this long factor each LM step by the scaled normal equations (bench: ~4x faster at
 * 1e6 points; QR takes over when the scaled JᵀJ is ill-conditioned, and the covariance always comes from QR). */
const NORMAL_EQUATIONS_FROM = 20_000;

export class FitSpecError extends Error {
  override name = "FitSpecError";
}

export function fitKinetics(t: ArrayLike<number>, y: ArrayLike<number>, spec: FitSpec): FitResult {
  const fixed = spec.fixed ?? {};
  if (spec.formula !== undefined) {
    let f;
    try {
      f = compileFormula(spec.formula);
    } catch (e) {
      if (e instanceof FormulaError) throw new FitSpecError(e.message);
      throw e;
    }
    for (const k of Object.keys(spec.start ?? {}))
      if (!f.params.includes(k)) throw new FitSpecError(`"${k}" is not a parameter of the formula (its parameters: ${f.params.join(", ")}).`);
    const missing = f.params.filter((p) => !(p in fixed) && !(p in (spec.start ?? {})));
    const start = { ...Object.fromEntries(missing.map((p) => [p, 1])), ...spec.start };
    const r = fitNonlinear("formula", f, t, y, { start, fixed, weighting: spec.weighting, alternativeStarts: [scaleStart(start, 0.1), scaleStart(start, 10)] });
    if (missing.length && r.converged) r.message += ` Start values of 1 were used for ${missing.join(", ")}.`;
    return { ...r, model: "formula", formula: f.expression };
  }
  const name = spec.model ?? "first-order";
  const tt = asFloat64(t),
    yy = asFloat64(y);
  switch (name) {
    case "linearized": {
      if ("ainf" in fixed) return linearizedFirstOrder(tt, yy, { ainf: fixed.ainf!, ainfSource: "fixed at the given value", weighted: spec.logWeights });
      const nl = fitKinetics(tt, yy, { model: "first-order", weighting: spec.weighting });
      const ainf = nl.parameters.find((p) => p.name === "ainf")?.value;
      if (!nl.converged || ainf == null)
        return failedFit("linearized", ["k", "a0", "ainf"], tt.length, `No fit: ainf was not given (--fix ainf=V) and could not be estimated: ${nl.message}`);
      return linearizedFirstOrder(tt, yy, { ainf, ainfSource: `estimated by the nonlinear first-order fit (${ainf.toPrecision(6)}), not measured`, weighted: spec.logWeights });
    }
    case "guggenheim":
      return guggenheim(tt, yy, spec.interval ?? NaN);
    case "kezdy-swinbourne":
      return kezdySwinbourne(tt, yy, spec.interval ?? NaN);
  }
  const model = BUILT_IN_MODELS[name];
  if (!model) throw new FitSpecError(`There is no model "${name}". Models: ${MODEL_NAMES.join(", ")}; or give --formula.`);
  for (const k of [...Object.keys(fixed), ...Object.keys(spec.start ?? {})])
    if (!model.params.includes(k)) throw new FitSpecError(`"${k}" is not a parameter of ${name} (its parameters: ${model.params.join(", ")}).`);
  const auto = model.starts(tt, yy, fixed);
  const starts = spec.start ? [{ ...auto[0], ...spec.start }, ...auto] : auto;
  const run = (s: Array<Record<string, number>>) =>
    fitNonlinear(name, model, tt, yy, {
      start: s[0]!,
      alternativeStarts: s.slice(1),
      fixed,
      lower: model.lower,
      weighting: spec.weighting,
      solver: tt.length >= NORMAL_EQUATIONS_FROM ? "normal-equations" : "qr",
    });
  let r = run(starts);
  if (r.converged && model.normalise) {
    const values = Object.fromEntries(r.parameters.map((p) => [p.name, p.value!]));
    const before = JSON.stringify(values);
    const note = model.normalise(values);
    // Relabelled parameters are refitted from the relabelled point, so SEs and correlations follow the labels.
    if (JSON.stringify(values) !== before) r = run([values]);
    if (note) r.warnings.push(note);
  }
  return r;
}

function scaleStart(s: Record<string, number>, f: number): Record<string, number> {
  return Object.fromEntries(Object.entries(s).map(([k, v]) => [k, v * f]));
}
