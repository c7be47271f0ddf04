// The fitting page's controls as plain data, and the one pure step from them to the options the engine and the
// server take (`fitOptionsSchema`, the schema POST /api/fits parses): a half-typed number is simply not used yet.
import { parseDecimalField, parseStartValues } from "@/lib/format/input";
import type { Conversion } from "@/lib/kinetics/workspace";
import type { FitOptions } from "@/lib/schemas/fits";

export interface FitControls {
  models: string[];
  formula: string;
  startsText: string;
  /** Seconds, as typed (the page converts from its own time unit). */
  windowFrom: string;
  windowTo: string;
  exclusions: Array<{ index: number; reason: string }>;
  fixAinf: string;
  logWeights: boolean;
  interval: string;
  epsilon: string;
  pathLength: string;
  useCalibration: boolean;
  /** The calibration the run's method (or the saved version) converts by, if any. */
  calibrationConv: Extract<Conversion, { kind: "calibration" }> | null;
  /** The conversion the page started from (a Beer–Lambert blank is kept from it). */
  startConv: Conversion | null;
}

/** A typed number, or null while it is empty or half-typed ("-", "1e", "0,0,"). */
function num(text: string): number | null {
  const v = parseDecimalField(text);
  return v !== null && Number.isFinite(v) ? v : null;
}

export function buildFitOptions(c: FitControls): FitOptions {
  const starts = Object.fromEntries(Object.entries(parseStartValues(c.startsText)).filter(([, v]) => Number.isFinite(v)));
  const from = num(c.windowFrom),
    to = num(c.windowTo),
    ainf = num(c.fixAinf),
    interval = num(c.interval),
    epsilon = num(c.epsilon);
  return {
    models: c.models as FitOptions["models"],
    ...(c.models.includes("formula") ? { formula: c.formula } : {}),
    ...(Object.keys(starts).length ? { starts } : {}),
    ...(from !== null || to !== null ? { window: { from, to } } : {}),
    ...(c.exclusions.length ? { exclusions: c.exclusions } : {}),
    ...(ainf !== null ? { fixed: { ainf } } : {}),
    ...(c.logWeights ? { logWeights: true } : {}),
    ...(interval ? { interval } : {}),
    ...(c.useCalibration && c.calibrationConv
      ? { conversion: c.calibrationConv }
      : epsilon
        ? { conversion: { kind: "beer-lambert" as const, epsilon, pathLengthCm: num(c.pathLength) ?? 1, ...(c.startConv?.kind === "beer-lambert" && c.startConv.blank != null ? { blank: c.startConv.blank } : {}) } }
        : {}),
  };
}
