// The model table: every model the engine fits, in the order pages list them. Adding a model is one file in this
// folder (its descriptor) and its line here, plus its test; the schemas, pages, CSV, PDF and CLI read this list.
import { biexponential } from "./biexponential";
import { firstOrder } from "./first-order";
import { formulaModel } from "./formula";
import { guggenheim } from "./guggenheim";
import { kezdySwinbourne } from "./kezdy-swinbourne";
import { linearized } from "./linearized";
import { secondOrder } from "./second-order";
import { timeScale, unitOf, type ModelDescriptor, type UnitContext } from "./types";
import { zeroOrder } from "./zero-order";

export const MODELS: readonly ModelDescriptor[] = [linearized, firstOrder, zeroOrder, secondOrder, biexponential, guggenheim, kezdySwinbourne, formulaModel];

/** Every model id, own formula included (the schemas' enum). */
export const MODEL_IDS = MODELS.map((m) => m.id) as [string, ...string[]];
/** The built-in models (no own formula): the CLI's --model names. */
export const MODEL_NAMES = MODELS.filter((m) => m.family !== "formula").map((m) => m.id);
/** What a new fit starts with. */
export const DEFAULT_MODELS = ["linearized", "first-order"];
/** What a new method starts with: its first model is the one its criteria judge, the nonlinear fit. */
export const DEFAULT_METHOD_MODELS = ["first-order", "linearized"];
/** The model a record's headline rate constant and a method's criteria fall back to. */
export const PRIMARY_MODEL = "first-order";

export function modelById(id: string): ModelDescriptor | undefined {
  return MODELS.find((m) => m.id === id);
}

export { firstOrderGridStart } from "./starts";
export { FitSpecError, noCurvature } from "./nonlinear";
export { fitUnits, timeScale, unitOf, type Dimension, type FitSpec, type ModelDescriptor, type NonlinearModel, type ParameterSpec, type UnitContext } from "./types";

/** A parameter's unit under the model table ("" dimensionless; null when unknown, as for own formulas). */
export function parameterUnit(modelId: string, param: string, ctx: UnitContext): string | null {
  const spec = modelById(modelId)?.params.find((p) => p.name === param);
  return spec ? unitOf(spec.dimension, ctx) : null;
}

/** The factor turning a per-second value of this parameter into per-minute (60 for rates, 1 otherwise). */
export function perMinuteFactor(modelId: string, param: string): number {
  const spec = modelById(modelId)?.params.find((p) => p.name === param);
  return spec ? timeScale(spec.dimension, 60) : 1;
}
