// The calibration workbench's state as plain data: the curve's fields, the standards as typed, the line's options and
// the unknown's readings; one reducer for every change, and the one pure step to the line, its figures and the
// prediction (the engine's `calibrate` and `inversePredict`, which the server runs again on save).
import { parseDecimalField } from "@/lib/format/input";
import { calibrate, inversePredict, type Calibration, type CalibrationWeighting, type SigmaSource } from "@/lib/kinetics/quantities";
import type { StandardRow } from "@/lib/methods/standards";

export type { StandardRow };

export interface SavedCalibration {
  id: number;
  name: string;
  analyte: string;
  concentration_unit: string;
  wavelength_nm: number | null;
  standards: Array<{ concentration: number; absorbance: number; replicate: number }>;
  options: { through_origin: boolean; weighting: CalibrationWeighting; sigma: SigmaSource; blank_sd: number | null };
}

export interface CalibrationState {
  name: string;
  analyte: string;
  unit: string;
  wavelength: string;
  rows: StandardRow[];
  origin: boolean;
  weighting: CalibrationWeighting;
  sigma: SigmaSource;
  blankSd: string;
  /** Readings of an unknown, replicates separated by spaces or semicolons. */
  readings: string;
}

const emptyRow = (): StandardRow => ({ concentration: "", absorbance: "", replicate: "1" });

export function initialCalibrationState(saved?: SavedCalibration): CalibrationState {
  return {
    name: saved?.name ?? "",
    analyte: saved?.analyte ?? "",
    unit: saved?.concentration_unit ?? "µmol/L",
    wavelength: saved?.wavelength_nm != null ? String(saved.wavelength_nm) : "",
    rows: saved ? saved.standards.map((s) => ({ concentration: String(s.concentration), absorbance: String(s.absorbance), replicate: String(s.replicate) })) : Array.from({ length: 6 }, emptyRow),
    origin: saved?.options.through_origin ?? false,
    weighting: saved?.options.weighting ?? "none",
    sigma: saved?.options.sigma ?? "residual",
    blankSd: saved?.options.blank_sd != null ? String(saved.options.blank_sd) : "",
    readings: "",
  };
}

type Field = Exclude<keyof CalibrationState, "rows">;

export type CalibrationAction =
  | { [K in Field]: { type: "set"; field: K; value: CalibrationState[K] } }[Field]
  | { type: "cell"; row: number; column: keyof StandardRow; value: string }
  | { type: "add-row" }
  | { type: "remove-row"; row: number }
  /** Standards read from pasted cells or a file replace the table. */
  | { type: "use-rows"; rows: StandardRow[] };

export function calibrationReducer(s: CalibrationState, a: CalibrationAction): CalibrationState {
  switch (a.type) {
    case "set":
      return { ...s, [a.field]: a.value };
    case "cell":
      return { ...s, rows: s.rows.map((r, i) => (i === a.row ? { ...r, [a.column]: a.value } : r)) };
    case "add-row":
      return { ...s, rows: [...s.rows, emptyRow()] };
    case "remove-row":
      return { ...s, rows: s.rows.filter((_, i) => i !== a.row) };
    case "use-rows":
      return a.rows.length ? { ...s, rows: a.rows } : s;
  }
}

export const toNumber = (s: string) => parseDecimalField(s) ?? NaN;

/** The standards that are numbers, the line through them (or why there is none) and the unknown's concentration. */
export function computeCalibration(s: CalibrationState) {
  const standards = s.rows
    .map((r) => ({ concentration: toNumber(r.concentration), absorbance: toNumber(r.absorbance), replicate: Math.max(1, Math.round(toNumber(r.replicate) || 1)) }))
    .filter((x) => Number.isFinite(x.concentration) && Number.isFinite(x.absorbance));
  let result: { cal: Calibration } | { error: string } | null = null;
  if (standards.length >= 3) {
    try {
      result = { cal: calibrate(standards.map((x) => x.concentration), standards.map((x) => x.absorbance), { throughOrigin: s.origin, weighting: s.weighting, sigma: s.sigma, blankSd: toNumber(s.blankSd) || undefined }) };
    } catch (e) {
      result = { error: (e as Error).message };
    }
  }
  const cal = result && "cal" in result ? result.cal : null;
  const ys = s.readings.split(/[\s;]+/).map(toNumber).filter(Number.isFinite);
  const prediction = cal && ys.length ? { ...inversePredict(cal, ys), m: ys.length } : null;
  return { standards, result, cal, prediction };
}

/** What POST /api/calibrations takes. */
export function calibrationBody(s: CalibrationState, standards: ReturnType<typeof computeCalibration>["standards"]) {
  return { name: s.name, analyte: s.analyte, concentration_unit: s.unit, wavelength_nm: toNumber(s.wavelength) || null, standards, through_origin: s.origin, weighting: s.weighting, sigma: s.sigma, blank_sd: toNumber(s.blankSd) || null };
}
