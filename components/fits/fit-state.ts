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

/** Everything the fitting page holds: the controls above, plus what is shown and what is being asked. */
export interface FitPageState extends FitControls {
  /** Times in minutes and k per minute on the page (stored in seconds). */
  perMinute: boolean;
  title: string;
  /** Why a new version is saved (required when changing a saved version). */
  saveReason: string;
  /** Points picked with the box-select tool. */
  selected: number[];
  /** Points waiting for a reason before they are excluded (one clicked, a box selection, or one typed by number). */
  pending: number[] | null;
  /** The reason being typed for them. */
  reason: string;
  /** The time at which −dy/dt is asked for, in the page's unit. */
  rateAt: string;
}

/** What the page starts from: a saved version's options when changing one, else the run's method, else defaults. */
export function initialFitState(input: {
  run: { name: string; path_length_cm: number | null };
  series: { name: string };
  initialModels: string[] | null;
  from: { title: string; options: FitOptions } | null;
  method: { models: string[]; formula: string | null; starts: Record<string, number> | null; window: { from_s: number | null; to_s: number | null }; weighting: string | null; pathLengthCm: number | null; conversion: Conversion | null } | null;
  defaultModels: string[];
  formatStarts: (s: Record<string, number>) => string;
}): FitPageState {
  const o = input.from?.options;
  // A new fit starts from the run's method; changing a saved version starts from that version's options.
  const m = o ? null : input.method;
  const startConv: Conversion | null = o ? (o.conversion ?? null) : (input.method?.conversion ?? null);
  const text = (v: number | null | undefined) => (v != null ? String(v) : "");
  return {
    models: input.initialModels ?? o?.models ?? m?.models ?? input.defaultModels,
    formula: o?.formula ?? m?.formula ?? "",
    startsText: input.formatStarts(o?.starts ?? m?.starts ?? {}),
    windowFrom: o ? text(o.window?.from) : text(m?.window.from_s),
    windowTo: o ? text(o.window?.to) : text(m?.window.to_s),
    exclusions: o?.exclusions ?? [],
    fixAinf: text(o?.fixed?.ainf),
    logWeights: o ? Boolean(o.logWeights) : m?.weighting === "log",
    interval: text(o?.interval),
    epsilon: startConv?.kind === "beer-lambert" ? String(startConv.epsilon) : "",
    pathLength: startConv?.kind === "beer-lambert" ? String(startConv.pathLengthCm) : String(input.run.path_length_cm ?? m?.pathLengthCm ?? 1),
    useCalibration: startConv?.kind === "calibration",
    calibrationConv: startConv?.kind === "calibration" ? startConv : input.method?.conversion?.kind === "calibration" ? input.method.conversion : null,
    startConv,
    perMinute: true,
    title: input.from?.title ?? `${input.run.name} · ${input.series.name}`,
    saveReason: "",
    selected: [],
    pending: null,
    reason: "",
    rateAt: "",
  };
}

type Field = Exclude<keyof FitPageState, "calibrationConv" | "startConv">;

export type FitAction =
  | { [K in Field]: { type: "set"; field: K; value: FitPageState[K] } }[Field]
  | { type: "toggle-model"; model: string; on: boolean }
  /** Ask for a reason before excluding these points (already excluded ones are left as they are). */
  | { type: "ask-exclusion"; indices: number[] }
  | { type: "cancel-exclusion" }
  /** Exclude the points waiting for a reason, with the reason typed (at least three characters). */
  | { type: "confirm-exclusion" }
  | { type: "restore"; index: number }
  /** Fit only the time range of the selected points (times in seconds). */
  | { type: "window-of-selection"; times: number[] };

export function fitReducer(s: FitPageState, a: FitAction): FitPageState {
  switch (a.type) {
    case "set":
      return { ...s, [a.field]: a.value };
    case "toggle-model":
      return { ...s, models: a.on ? (s.models.includes(a.model) ? s.models : [...s.models, a.model]) : s.models.filter((x) => x !== a.model) };
    case "ask-exclusion": {
      const excluded = new Set(s.exclusions.map((e) => e.index));
      const indices = a.indices.filter((i) => !excluded.has(i));
      return indices.length ? { ...s, pending: indices, reason: "" } : s;
    }
    case "cancel-exclusion":
      return { ...s, pending: null };
    case "confirm-exclusion": {
      const reason = s.reason.trim();
      if (!s.pending || reason.length < 3) return s;
      const excluded = new Set(s.exclusions.map((e) => e.index));
      const add = s.pending.filter((i) => !excluded.has(i)).map((index) => ({ index, reason }));
      return { ...s, exclusions: [...s.exclusions, ...add].sort((x, y) => x.index - y.index), pending: null, selected: [], reason: "" };
    }
    case "restore":
      return { ...s, exclusions: s.exclusions.filter((e) => e.index !== a.index) };
    case "window-of-selection":
      if (!a.times.length) return s;
      return { ...s, windowFrom: String(Math.min(...a.times)), windowTo: String(Math.max(...a.times)), selected: [] };
  }
}
