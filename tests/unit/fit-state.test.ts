// The fitting page's controls → options step (components/fits/fit-state.ts) gives what POST /api/fits accepts: every
// case below is parsed by the route's own schema (fitOptionsSchema); half-typed numbers are left out, not sent.
import { describe, expect, it } from "vitest";
import { buildFitOptions, type FitControls } from "@/components/fits/fit-state";
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
