// A method's acceptance criteria, evaluated on one fit: each criterion passes, fails, or cannot be evaluated (which
// counts as not passed: a criterion nobody could check has not been met).
import { PRIMARY_MODEL } from "./models";
import type { SeriesFitOutcome } from "./workspace";

export type Criterion =
  | { kind: "r2_min"; value: number }
  | { kind: "runs_z_max"; value: number }
  | { kind: "rel_se_k_max"; value: number }
  | { kind: "min_points"; value: number }
  | { kind: "absorbance_window"; min: number; max: number }
  | { kind: "converged" };

export interface CriterionResult {
  kind: Criterion["kind"];
  /** What was asked, in words with the limit ("r² ≥ 0.995"). */
  label: string;
  /** What the fit gave, formatted for people (null when it could not be evaluated). */
  observed: string | null;
  value: number | null;
  pass: boolean;
  note: string | null;
}

export interface CriteriaEvaluation {
  model: string;
  results: CriterionResult[];
  passed: boolean;
  failed: number;
}

const fmt = (v: number, digits = 4) => (Number.isFinite(v) ? Number(v.toPrecision(digits)).toString() : String(v));

export function describeCriterion(c: Criterion): string {
  switch (c.kind) {
    case "r2_min":
      return `r² ≥ ${c.value}`;
    case "runs_z_max":
      return `|runs test z| ≤ ${c.value}`;
    case "rel_se_k_max":
      return `SE(k)/k ≤ ${fmt(100 * c.value, 3)} %`;
    case "min_points":
      return `at least ${c.value} points fitted`;
    case "absorbance_window":
      return `readings within ${c.min} to ${c.max}`;
    case "converged":
      return "the fit converged";
  }
}

/** The model a method's criteria judge: the first of its models in the outcome, else the primary model's fit, else the first. */
export function judgedModel(outcome: Pick<SeriesFitOutcome, "models">, preferred: readonly string[]): string | null {
  for (const m of preferred) if (outcome.models.some((x) => x.model === m)) return m;
  return outcome.models.find((x) => x.model === PRIMARY_MODEL)?.model ?? outcome.models[0]?.model ?? null;
}

export function evaluateCriteria(outcome: Pick<SeriesFitOutcome, "models" | "n" | "reading_range">, criteria: readonly Criterion[], preferred: readonly string[] = []): CriteriaEvaluation {
  const model = judgedModel(outcome, preferred);
  const m = outcome.models.find((x) => x.model === model);
  const r = m?.result;
  const results = criteria.map((c): CriterionResult => {
    const label = describeCriterion(c);
    const missing = (note: string): CriterionResult => ({ kind: c.kind, label, observed: null, value: null, pass: false, note });
    if (!r) return missing("No fit to judge.");
    switch (c.kind) {
      case "r2_min":
        return r.r2 === null ? missing("The fit gives no r².") : { kind: c.kind, label, observed: fmt(r.r2, 6), value: r.r2, pass: r.r2 >= c.value, note: null };
      case "runs_z_max":
        return r.runs_z === null
          ? missing("Too few residuals of each sign for the runs test.")
          : { kind: c.kind, label, observed: fmt(r.runs_z, 3), value: r.runs_z, pass: Math.abs(r.runs_z) <= c.value, note: null };
      case "rel_se_k_max": {
        const k = r.parameters.find((p) => p.name === "k");
        if (!k || k.value === null || k.se === null || k.value === 0) return missing("The model gives no rate constant with a standard error.");
        const rel = Math.abs(k.se / k.value);
        return { kind: c.kind, label, observed: `${fmt(100 * rel, 3)} %`, value: rel, pass: rel <= c.value, note: null };
      }
      case "min_points":
        return { kind: c.kind, label, observed: String(r.n), value: r.n, pass: r.n >= c.value, note: null };
      case "absorbance_window": {
        const range = outcome.reading_range;
        if (!range) return missing("No readings were fitted.");
        const pass = range[0] >= c.min && range[1] <= c.max;
        return { kind: c.kind, label, observed: `${fmt(range[0])} to ${fmt(range[1])}`, value: null, pass, note: pass ? null : "Some fitted readings fall outside the window; narrow the fitting window or dilute." };
      }
      case "converged":
        return { kind: c.kind, label, observed: r.converged ? "yes" : "no", value: null, pass: r.converged, note: r.converged ? null : r.message };
    }
  });
  const failed = results.filter((x) => !x.pass).length;
  return { model: model ?? "none", results, passed: failed === 0, failed };
}
