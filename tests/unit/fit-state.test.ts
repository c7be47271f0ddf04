// The fitting page's controls → options step (components/fits/fit-state.ts) gives what POST /api/fits accepts: every
// case below is parsed by the route's own schema (fitOptionsSchema); half-typed numbers are left out, not sent.
import { describe, expect, it } from "vitest";
import { buildFitOptions, fitReducer, initialFitState, type FitControls } from "@/components/fits/fit-state";
import { formatStartValues } from "@/lib/format/input";
import { fitOptionsSchema } from "@/lib/schemas/fits";

const base: FitControls = {
  models: ["linearized", "first-order"],
  formula: "",
  startsText: "",
  windowFrom: "",
  windowTo: "",
  exclusions: [],
  fixAinf: "",
  logWeights: false,
  interval: "",
  epsilon: "",
  pathLength: "1",
  useCalibration: false,
  calibrationConv: null,
  startConv: null,
};

describe("buildFitOptions", () => {
  it("the defaults are the models alone", () => {
    expect(fitOptionsSchema.parse(buildFitOptions(base))).toEqual({ models: ["linearized", "first-order"] });
  });

  it("window, exclusions, fixed A∞, weights, interval and Beer–Lambert (with the method's blank) reach the options", () => {
    const o = buildFitOptions({
      ...base,
      models: ["first-order", "guggenheim"],
      windowFrom: "60",
      exclusions: [{ index: 4, reason: "air bubble" }],
      fixAinf: "0,045",
      logWeights: true,
      interval: "200",
      epsilon: "87000",
      pathLength: "0.5",
      startConv: { kind: "beer-lambert", epsilon: 87000, pathLengthCm: 0.5, blank: 0.012 },
    });
    expect(fitOptionsSchema.parse(o)).toEqual({
      models: ["first-order", "guggenheim"],
      window: { from: 60, to: null },
      exclusions: [{ index: 4, reason: "air bubble" }],
      fixed: { ainf: 0.045 },
      logWeights: true,
      interval: 200,
      conversion: { kind: "beer-lambert", epsilon: 87000, pathLengthCm: 0.5, blank: 0.012 },
    });
  });

  it("a formula and its start values go together; half-typed values are not sent", () => {
    const o = buildFitOptions({ ...base, models: ["formula"], formula: "a*exp(-k*t)+c", startsText: "k=0.002, a=1, c=", fixAinf: "0.", windowTo: "-" });
    expect(fitOptionsSchema.parse(o)).toMatchObject({ models: ["formula"], formula: "a*exp(-k*t)+c", starts: { k: 0.002, a: 1 } });
    expect(o).not.toHaveProperty("window");
    expect(o.starts).not.toHaveProperty("c");
  });

  it("the calibration wins over Beer–Lambert when chosen", () => {
    const cal = { kind: "calibration" as const, calibrationId: 3, slope: 0.12303, intercept: 0.0016333, unit: "µmol/L" };
    const o = buildFitOptions({ ...base, useCalibration: true, calibrationConv: cal as FitControls["calibrationConv"], epsilon: "87000" });
    expect(o.conversion).toEqual(cal);
  });
});

// The page's whole state: where it starts and what each action does (components/fits/fit-state.ts).
const run = { name: "Corvane blue 25 °C", path_length_cm: 1 };
const series = { name: "Cell 1" };
const start = (over: Partial<Parameters<typeof initialFitState>[0]> = {}) =>
  initialFitState({ run, series, initialModels: null, from: null, method: null, defaultModels: ["linearized", "first-order"], formatStarts: formatStartValues, ...over });

describe("initialFitState", () => {
  it("a new fit without a method: the default models, the run's path length, times in minutes, a title from run and series", () => {
    const s = start();
    expect(buildFitOptions(s)).toEqual({ models: ["linearized", "first-order"] });
    expect(s).toMatchObject({ pathLength: "1", perMinute: true, title: "Corvane blue 25 °C · Cell 1", pending: null, selected: [] });
  });

  it("changing a saved version starts from every one of its options: they come back unchanged", () => {
    const saved = {
      models: ["linearized", "first-order", "guggenheim", "formula"],
      formula: "a*exp(-k*t)+c",
      starts: { k: 0.002, a: 1 },
      window: { from: 60, to: 1800 },
      exclusions: [{ index: 3, reason: "air bubble" }],
      fixed: { ainf: 0.045 },
      logWeights: true,
      interval: 240,
      conversion: { kind: "beer-lambert" as const, epsilon: 87000, pathLengthCm: 0.5, blank: 0.012 },
    };
    const s = start({ from: { title: "CB 25 °C", options: fitOptionsSchema.parse(saved) } });
    expect(buildFitOptions(s)).toEqual(saved);
    expect(s.title).toBe("CB 25 °C");
  });

  it("a saved version converted by calibration keeps it", () => {
    const cal = { kind: "calibration" as const, calibrationId: 3, slope: 0.12303, seSlope: 0.0011, intercept: 0.0016333, unit: "µmol/L" };
    const s = start({ from: { title: "x", options: fitOptionsSchema.parse({ models: ["first-order"], conversion: cal }) } });
    expect(s.useCalibration).toBe(true);
    expect(buildFitOptions(s).conversion).toEqual(cal);
  });

  it("a new fit starts from the run's method: models, window, weighting, formula, start values and conversion", () => {
    const method = { models: ["first-order", "formula"], formula: "b1*exp(-b2*t)", starts: { b2: 0.001 }, window: { from_s: 30, to_s: null }, weighting: "log", pathLengthCm: 2, conversion: { kind: "beer-lambert" as const, epsilon: 50000, pathLengthCm: 2 } };
    const s = start({ method });
    expect(buildFitOptions(s)).toEqual({ models: ["first-order", "formula"], formula: "b1*exp(-b2*t)", starts: { b2: 0.001 }, window: { from: 30, to: null }, logWeights: true, conversion: { kind: "beer-lambert", epsilon: 50000, pathLengthCm: 2 } });
  });

  it("models named in the address win over the method's", () => {
    expect(start({ initialModels: ["zero-order"] }).models).toEqual(["zero-order"]);
  });
});

describe("fitReducer", () => {
  it("sets any one control", () => {
    let s = start();
    s = fitReducer(s, { type: "set", field: "fixAinf", value: "0.05" });
    s = fitReducer(s, { type: "set", field: "perMinute", value: false });
    expect(s.fixAinf).toBe("0.05");
    expect(s.perMinute).toBe(false);
    expect(buildFitOptions(s).fixed).toEqual({ ainf: 0.05 });
  });

  it("toggles a model on once and off", () => {
    let s = fitReducer(start(), { type: "toggle-model", model: "zero-order", on: true });
    s = fitReducer(s, { type: "toggle-model", model: "zero-order", on: true });
    expect(s.models).toEqual(["linearized", "first-order", "zero-order"]);
    expect(fitReducer(s, { type: "toggle-model", model: "linearized", on: false }).models).toEqual(["first-order", "zero-order"]);
  });

  it("excludes only with a reason of three characters or more, sorted, and clears the selection", () => {
    let s = fitReducer(start(), { type: "set", field: "selected", value: [9, 2] });
    s = fitReducer(s, { type: "ask-exclusion", indices: [9, 2] });
    expect(s.pending).toEqual([9, 2]);
    s = fitReducer(s, { type: "set", field: "reason", value: " x " });
    expect(fitReducer(s, { type: "confirm-exclusion" })).toBe(s);
    s = fitReducer(s, { type: "set", field: "reason", value: " bubble " });
    s = fitReducer(s, { type: "confirm-exclusion" });
    expect(s.exclusions).toEqual([{ index: 2, reason: "bubble" }, { index: 9, reason: "bubble" }]);
    expect(s).toMatchObject({ pending: null, selected: [], reason: "" });
    // Asking again for points already excluded asks nothing; restoring one gives it back.
    expect(fitReducer(s, { type: "ask-exclusion", indices: [2] }).pending).toBeNull();
    expect(fitReducer(s, { type: "restore", index: 2 }).exclusions).toEqual([{ index: 9, reason: "bubble" }]);
  });

  it("cancelling leaves the exclusions as they were", () => {
    const s = fitReducer(fitReducer(start(), { type: "ask-exclusion", indices: [1] }), { type: "cancel-exclusion" });
    expect(s.pending).toBeNull();
    expect(s.exclusions).toEqual([]);
  });

  it("fits only the selection's time range", () => {
    const s = fitReducer(fitReducer(start(), { type: "set", field: "selected", value: [4, 5] }), { type: "window-of-selection", times: [240, 120, 300] });
    expect(buildFitOptions(s).window).toEqual({ from: 120, to: 300 });
    expect(s.selected).toEqual([]);
  });
});
