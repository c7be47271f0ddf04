// The calibration workbench's state (components/methods/calibration-state.ts): where it starts, each action, and the
// body it saves, parsed by the route's own schema (createCalibrationSchema). Invented standards: only the wiring is
// checked here; the line's numbers are checked against references in tests/unit/kinetics.
import { describe, expect, it } from "vitest";
import { calibrationBody, calibrationReducer, computeCalibration, initialCalibrationState, type SavedCalibration } from "@/components/methods/calibration-state";
import { calibrate } from "@/lib/kinetics/quantities";
import { createCalibrationSchema } from "@/lib/schemas/methods";

const rows = [
  ["0", "0.002"],
  ["2", "0.176"],
  ["4", "0.351"],
  ["6", "0.522"],
].map(([c, a]) => ({ concentration: c!, absorbance: a!, replicate: "1" }));

describe("calibration state", () => {
  it("a new curve starts with six empty standards and no line", () => {
    const s = initialCalibrationState();
    expect(s.rows).toHaveLength(6);
    expect(computeCalibration(s).result).toBeNull();
  });

  it("a saved curve starts from its standards and options", () => {
    const saved: SavedCalibration = { id: 1, name: "Blue", analyte: "dye", concentration_unit: "mg/L", wavelength_nm: 590, standards: [{ concentration: 1, absorbance: 0.1, replicate: 2 }], options: { through_origin: true, weighting: "1/x", sigma: "blank", blank_sd: 0.001 } };
    expect(initialCalibrationState(saved)).toMatchObject({ name: "Blue", unit: "mg/L", wavelength: "590", rows: [{ concentration: "1", absorbance: "0.1", replicate: "2" }], origin: true, weighting: "1/x", sigma: "blank", blankSd: "0.001" });
  });

  it("cells, rows and pasted rows change the table; the line is the engine's own", () => {
    let s = calibrationReducer(initialCalibrationState(), { type: "use-rows", rows });
    s = calibrationReducer(s, { type: "add-row" });
    s = calibrationReducer(s, { type: "cell", row: 4, column: "concentration", value: "8" });
    s = calibrationReducer(s, { type: "cell", row: 4, column: "absorbance", value: "0,701" });
    expect(s.rows).toHaveLength(5);
    const { standards, cal } = computeCalibration(s);
    expect(standards.map((x) => x.absorbance)).toEqual([0.002, 0.176, 0.351, 0.522, 0.701]);
    expect(cal!.slope).toBe(calibrate([0, 2, 4, 6, 8], [0.002, 0.176, 0.351, 0.522, 0.701], { throughOrigin: false, weighting: "none", sigma: "residual" }).slope);
    s = calibrationReducer(s, { type: "remove-row", row: 4 });
    expect(computeCalibration(s).standards).toHaveLength(4);
    // An empty paste leaves the table as it is.
    expect(calibrationReducer(s, { type: "use-rows", rows: [] })).toBe(s);
  });

  it("the unknown's readings give a prediction; the saved body is what the route accepts", () => {
    let s = calibrationReducer(initialCalibrationState(), { type: "use-rows", rows });
    s = calibrationReducer(s, { type: "set", field: "readings", value: "0.30 0.31; 0.29" });
    s = calibrationReducer(s, { type: "set", field: "name", value: "Blue dye" });
    s = calibrationReducer(s, { type: "set", field: "analyte", value: "in-house blue" });
    s = calibrationReducer(s, { type: "set", field: "wavelength", value: "590" });
    const { standards, prediction } = computeCalibration(s);
    expect(prediction!.m).toBe(3);
    const body = createCalibrationSchema.parse(calibrationBody(s, standards));
    expect(body).toMatchObject({ name: "Blue dye", analyte: "in-house blue", wavelength_nm: 590, through_origin: false, weighting: "none", sigma: "residual", blank_sd: null });
  });
});
