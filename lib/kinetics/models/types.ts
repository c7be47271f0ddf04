// What every model of the engine declares about itself: one descriptor per file in this folder, so the schemas, every
// list in the UI, the units in CSV and PDF, the criteria's primary model and the docs all read the same facts.
import type { FitResult, ModelFunction, Weighting } from "../types";

/** How a parameter's unit follows from the data's y unit and time unit. */
export type Dimension = "y" | "1/t" | "y/t" | "1/(y t)" | "none" | "unknown";

export interface ParameterSpec {
  name: string;
  /** Plain words for a reader. */
  label: string;
  dimension: Dimension;
}

export interface FitSpec {
  model?: string;
  formula?: string;
  fixed?: Record<string, number>;
  start?: Record<string, number>;
  /** Seconds, for Guggenheim and Kezdy–Swinbourne. */
  interval?: number;
  /** An interval that pairs too few readings is moved to the nearest that pairs them, with a note (the workspace does;
   * `cli fit` keeps the interval exactly as asked, as its contract says). */
  snapInterval?: boolean;
  weighting?: Weighting;
  /** Linearized fit: weight by (y − A∞)². */
  logWeights?: boolean;
}

export type ModelFamily = "nonlinear" | "straight-line" | "formula";

export interface ModelDescriptor {
  id: string;
  label: string;
  family: ModelFamily;
  /** The model in standard notation, for pages, reports and docs. */
  equation: string;
  params: readonly ParameterSpec[];
  /** Its sum of squares is in the data's own units, so AICc can compare it with the others that are. */
  comparable: boolean;
  /** Its rate constant's unit carries concentration, so a calibration slope's uncertainty enters k. */
  kScalesWithConcentration: boolean;
  /** k is a first-order rate constant: t½ = ln 2 / k and t90 = ln 10 / k apply. */
  firstOrderK: boolean;
  /** Needs a fixed time interval between paired readings (Guggenheim, Kezdy–Swinbourne). */
  needsInterval: boolean;
  fit(t: Float64Array, y: Float64Array, spec: FitSpec): FitResult;
  /** The fitted curve at any times from the fitted values (plots on any grid); null for straight-line methods. */
  curve: ((t: Float64Array, values: Record<string, number>) => Float64Array) | null;
  /** A built-in nonlinear model's function and Jacobian (global fits build on it); absent for the others. */
  fn?: NonlinearModel;
}

/** A built-in nonlinear model: the function, its Jacobian, bounds, start rule and how it moves to another time origin. */
export interface NonlinearModel extends ModelFunction {
  lower: Record<string, number>;
  /** Start values from the data (and alternatives to try when the first start fails), on times starting at 0. */
  starts(t: Float64Array, y: Float64Array, fixed: Record<string, number>): Array<Record<string, number>>;
  /** Optional tidy-up after the fit (e.g. ordering exchangeable parameters); returns a warning when it changed labels. */
  normalise?(values: Record<string, number>): string | null;
  /**
   * Parameters fitted with times counted from tref, moved to the user's origin (t = 0): the new values and the
   * derivative of each new value with respect to each fitted one (row per parameter, in `params` order), or for a
   * value that cannot be represented (an amplitude extrapolated past overflow) null with the reason.
   */
  toOrigin?(values: Record<string, number>, tref: number): { values: Record<string, number | null>; gradient: number[][]; notes: string[] };
  /** A straight line in t (zero order): the no-curvature check does not apply. */
  straight?: boolean;
  /** A doubt about a converged fit that only this model can see (two phases that cannot be told apart). */
  check?(r: FitResult): string | null;
  /** Parameters whose meaning depends on the time origin: fixing one keeps the fit in the user's own times. */
  originDependent: readonly string[];
}

export interface UnitContext {
  /** Unit of the fitted values: "AU", "mol L⁻¹" or a calibration's unit. */
  y: string;
  /** Unit of time on the page: "s" or "min". */
  t: string;
}

function inverse(u: string): string {
  if (u === "mol L⁻¹") return "L mol⁻¹";
  return /^[^\s/·]+$/.test(u) ? `${u}⁻¹` : `(${u})⁻¹`;
}

/** The unit of a parameter of the given dimension; "" for dimensionless, null when the model cannot say (own formulas). */
export function unitOf(dimension: Dimension, ctx: UnitContext): string | null {
  switch (dimension) {
    case "y":
      return ctx.y;
    case "1/t":
      return `${ctx.t}⁻¹`;
    case "y/t":
      return `${ctx.y} ${ctx.t}⁻¹`;
    case "1/(y t)":
      return `${inverse(ctx.y)} ${ctx.t}⁻¹`;
    case "none":
      return "";
    case "unknown":
      return null;
  }
}

/** Factor that turns a per-second value of this dimension into the per-`t` unit (60 for min). */
export function timeScale(dimension: Dimension, secondsPerUnit: number): number {
  return dimension === "1/t" || dimension === "y/t" || dimension === "1/(y t)" ? secondsPerUnit : 1;
}

/** The units of a fit's values: absorbance (AU), Beer–Lambert concentration (mol L⁻¹) or a calibration's unit. */
export function fitUnits(quantity: "absorbance" | "concentration", conversion?: { kind: string; unit?: string } | null, t = "s"): UnitContext {
  if (quantity !== "concentration") return { y: "AU", t };
  return { y: conversion?.kind === "calibration" && conversion.unit ? conversion.unit : "mol L⁻¹", t };
}

/** Why a value at t = 0 is not given: t = 0 lies too far before the first reading for it to be represented. */
export function outOfRangeAtZero(name: string, secondsBefore: number, atFirstReading: number): string {
  return `${name} is the value at t = 0, ${secondsBefore.toPrecision(4)} s before the first reading: extrapolated that far it is out of range, so it is not given. At the first reading it is ${atFirstReading.toPrecision(6)}.`;
}

/** The parameters a fit ran off with, in words ("k ran off towards +infinity (3.2e+9)"). */
export function ranOff(params: ReadonlyArray<{ name: string; value: number | null }>): string {
  return params.map((p) => `${p.name} ran off towards ${p.value! > 0 ? "+" : "−"}infinity (${p.value!.toPrecision(3)})`).join(", ");
}
