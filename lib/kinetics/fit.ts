// The engine's one entry point for a kinetic fit of one series: any model of the model table, or an own formula.
import { formulaModel } from "./models/formula";
import { FitSpecError, MODEL_NAMES, modelById, type FitSpec } from "./models";
import { asFloat64 } from "./nls";
import type { FitResult } from "./types";

export { FitSpecError, MODEL_NAMES, type FitSpec };

export function fitKinetics(t: ArrayLike<number>, y: ArrayLike<number>, spec: FitSpec): FitResult {
  const tt = asFloat64(t),
    yy = asFloat64(y);
  if (spec.formula !== undefined) return formulaModel.fit(tt, yy, spec);
  const name = spec.model ?? "first-order";
  const model = modelById(name);
  if (!model || model.family === "formula") throw new FitSpecError(`There is no model "${name}". Models: ${MODEL_NAMES.join(", ")}; or give --formula.`);
  return model.fit(tt, yy, spec);
}
