// The model table: every model the engine fits, in the order pages list them. Adding a model is one file in this
// folder (its descriptor) and its line here, plus its test; the schemas, pages, CSV, PDF and CLI read this list.
import { biexponential } from "./biexponential";
import { firstOrder } from "./first-order";
import { formulaModel } from "./formula";
import { guggenheim } from "./guggenheim";
import { kezdySwinbourne } from "./kezdy-swinbourne";
import { linearized } from "./linearized";
import { secondOrder } from "./second-order";
import type { ModelDescriptor } from "./types";
import { zeroOrder } from "./zero-order";

export const MODELS: readonly ModelDescriptor[] = [linearized, firstOrder, zeroOrder, secondOrder, biexponential, guggenheim, kezdySwinbourne, formulaModel];

/** Every model id, own formula included (the schemas' enum). */
export const MODEL_IDS = MODELS.map((m) => m.id) as [string, ...string[]];
/** The built-in models (no own formula): the CLI's --model names. */
export const MODEL_NAMES = MODELS.filter((m) => m.family !== "formula").map((m) => m.id);
/** What a new fit and a new method start with. */
export const DEFAULT_MODELS = ["linearized", "first-order"];
/** The model a record's headline rate constant and a method's criteria fall back to. */
export const PRIMARY_MODEL = "first-order";

export function modelById(id: string): ModelDescriptor | undefined {
  return MODELS.find((m) => m.id === id);
}

export { firstOrderGridStart } from "./starts";
export { FitSpecError, noCurvature } from "./nonlinear";
export { timeScale, unitOf, type Dimension, type FitSpec, type ModelDescriptor, type NonlinearModel, type ParameterSpec, type UnitContext } from "./types";
