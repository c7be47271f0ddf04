// The method form's values as typed (text for numbers, every criterion with a tick), where they start, and the one
// schema the form is checked with: the values turned into the request body, then the route's own schema
// (createMethodSchema, or newMethodVersionSchema with a reason), so the form refuses exactly what the route refuses.
// Issue paths are the body's (definition.window.from_s, …); the form's fields carry the same names.
import { bodySchema } from "@/components/forms/schema-form";
import { formatStartValues, parseDecimalField, parseStartValues } from "@/lib/format/input";
import type { Criterion } from "@/lib/kinetics/criteria";
import { DEFAULT_METHOD_MODELS, MODELS } from "@/lib/kinetics/models";
import { createMethodSchema, newMethodVersionSchema, type MethodDefinition } from "@/lib/schemas/methods";

/** Models a method can name: all but those needing a pairing interval, which a method does not record. */
export const METHOD_MODELS = MODELS.filter((m) => !m.needsInterval).map((m) => ({ id: m.id, label: m.family === "formula" ? "The method's own formula" : m.label }));

export type CriterionKind = Criterion["kind"];
export const CRITERIA: Array<{ kind: CriterionKind; name: string; label: string; fields: Array<{ key: "value" | "min" | "max"; label: string; fallback: string; scale?: number }> }> = [
  { kind: "r2_min", name: "Goodness of fit", label: "r² at least", fields: [{ key: "value", label: "r² at least", fallback: "0.995" }] },
  { kind: "runs_z_max", name: "Random residuals", label: "runs test |z| at most", fields: [{ key: "value", label: "runs test |z| at most", fallback: "1.96" }] },
  { kind: "rel_se_k_max", name: "Precision of k", label: "SE(k)/k at most (%)", fields: [{ key: "value", label: "SE(k)/k at most (%)", fallback: "5", scale: 0.01 }] },
  { kind: "min_points", name: "Enough points", label: "points fitted at least", fields: [{ key: "value", label: "points fitted at least", fallback: "20" }] },
  { kind: "absorbance_window", name: "Reading window", label: "readings within", fields: [{ key: "min", label: "readings from (AU)", fallback: "0.1" }, { key: "max", label: "readings to (AU)", fallback: "1.5" }] },
  { kind: "converged", name: "Convergence", label: "the fit converged", fields: [] },
];

export interface CriterionValues {
  on: boolean;
  value: string;
  min: string;
  max: string;
}

export interface MethodFormValues {
  definition: {
    name: string;
    analyte: string;
    wavelength_nm: string;
    path_length_cm: string;
    concentration: { kind: MethodDefinition["concentration"]["kind"]; epsilon: string; calibration_id: string };
    blank: { kind: MethodDefinition["blank"]["kind"]; value: string };
    models: string[];
    weighting: "none" | "log";
    window: { from_s: string; to_s: string };
    custom_models: Array<{ name: string; formula: string; starts: string }>;
    /** Every criterion in CRITERIA's order, ticked or not. */
    criteria: CriterionValues[];
    notes: string;
  };
  reason: string;
}

const text = (v: number | null | undefined) => (v == null ? "" : String(v));

export function methodFormDefaults(initial: MethodDefinition | undefined, calibrations: ReadonlyArray<{ id: number }>): MethodFormValues {
  const c = initial?.concentration;
  return {
    definition: {
      name: initial?.name ?? "",
      analyte: initial?.analyte ?? "",
      wavelength_nm: text(initial?.wavelength_nm),
      path_length_cm: String(initial?.path_length_cm ?? 1),
      concentration: { kind: c?.kind ?? "none", epsilon: c?.kind === "beer-lambert" ? String(c.epsilon) : "", calibration_id: c?.kind === "calibration" ? String(c.calibration_id) : String(calibrations[0]?.id ?? "") },
      blank: { kind: initial?.blank.kind ?? "none", value: initial?.blank.kind === "value" ? String(initial.blank.value) : "" },
      models: initial?.models ?? [...DEFAULT_METHOD_MODELS],
      weighting: initial?.weighting ?? "none",
      window: { from_s: text(initial?.window.from_s), to_s: text(initial?.window.to_s) },
      custom_models: initial?.custom_models.map((m) => ({ name: m.name, formula: m.formula, starts: formatStartValues(m.starts) })) ?? [],
      criteria: CRITERIA.map((spec) => {
        const have = initial?.criteria.find((x) => x.kind === spec.kind);
        const field = (key: "value" | "min" | "max") => {
          const f = spec.fields.find((x) => x.key === key);
          if (!f) return "";
          const v = have && key in have ? (have as Partial<Record<typeof key, number>>)[key] : undefined;
          return v === undefined ? f.fallback : String(f.scale ? Number((v / f.scale).toPrecision(6)) : v);
        };
        return { on: Boolean(have), value: field("value"), min: field("min"), max: field("max") };
      }),
      notes: initial?.notes ?? "",
    },
    reason: "",
  };
}

const num = parseDecimalField;

/** The request body from the form's values (numbers read as the page reads them; a ticked criterion's fields scaled). */
export function methodBody(v: MethodFormValues, versioned: boolean) {
  const d = v.definition;
  const c = d.concentration;
  const definition = {
    name: d.name,
    analyte: d.analyte,
    wavelength_nm: num(d.wavelength_nm),
    path_length_cm: num(d.path_length_cm) ?? 1,
    concentration: c.kind === "beer-lambert" ? { kind: c.kind, epsilon: num(c.epsilon) } : c.kind === "calibration" ? { kind: c.kind, calibration_id: Number(c.calibration_id) } : { kind: "none" as const },
    blank: d.blank.kind === "value" ? { kind: "value" as const, value: num(d.blank.value) } : { kind: d.blank.kind },
    models: d.models,
    weighting: d.weighting,
    window: { from_s: num(d.window.from_s), to_s: num(d.window.to_s) },
    custom_models: d.custom_models.map((m) => ({ name: m.name, formula: m.formula, starts: parseStartValues(m.starts) })),
    criteria: CRITERIA.flatMap((spec, i) => {
      const s = d.criteria[i]!;
      if (!s.on) return [];
      const out: Record<string, unknown> = { kind: spec.kind };
      for (const f of spec.fields) out[f.key] = (num(s[f.key]) ?? NaN) * (f.scale ?? 1);
      return [out];
    }),
    notes: d.notes,
  };
  return versioned ? { definition, reason: v.reason } : { definition };
}

/** The form's schema: its values → the body → the route's own schema. */
export function methodFormSchema(versioned: boolean) {
  return bodySchema((v: MethodFormValues) => methodBody(v, versioned), versioned ? newMethodVersionSchema : createMethodSchema);
}

/** The form field an issue of the body belongs to: criteria are numbered among the ticked ones in the body. */
export function formPath(path: string, v: MethodFormValues): string {
  const m = path.match(/^definition\.criteria\.(\d+)(\..*)?$/);
  if (!m) return path;
  const ticked = v.definition.criteria.flatMap((c, i) => (c.on ? [i] : []));
  const i = ticked[Number(m[1])];
  return i === undefined ? path : `definition.criteria.${i}${m[2] ?? ""}`;
}
