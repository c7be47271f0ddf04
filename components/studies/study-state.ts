// A study page's edits as plain data (changed temperatures with reasons, fits left out or added, the name, the target
// temperature and why), one reducer for them, and the pure steps to what the page shows and saves: the prediction at
// the target temperature, the Eyring band, and the body of PUT /api/studies/:id (changeStudySchema).
import { halfLife, t90 } from "@/lib/kinetics/quantities";
import { celsiusToKelvin, eyringBand, predictRateConstant, type RatePoint } from "@/lib/kinetics/temperature";
import type { ChangeStudy } from "@/lib/schemas/studies";
import type { StudyRecord } from "@/lib/studies";

export interface StudyEdits {
  /** Temperatures typed per fit (°C), and why each differs from the run's. */
  temps: Record<number, string>;
  reasons: Record<number, string>;
  why: string;
  target: string;
  name: string;
  removed: number[];
  /** A fit to add: its label from the list, or its number. */
  added: string;
}

export function initialStudyEdits(study: Pick<StudyRecord, "name" | "options">): StudyEdits {
  return { temps: {}, reasons: {}, why: "", target: String(study.options.target_c ?? 25), name: study.name, removed: [], added: "" };
}

type Field = "why" | "target" | "name" | "added";

export type StudyEditAction =
  | { type: "set"; field: Field; value: string }
  | { type: "temperature"; fitId: number; value: string }
  | { type: "reason"; fitId: number; value: string }
  | { type: "leave-out"; fitId: number; out: boolean };

export function studyEditReducer(s: StudyEdits, a: StudyEditAction): StudyEdits {
  switch (a.type) {
    case "set":
      return { ...s, [a.field]: a.value };
    case "temperature":
      return { ...s, temps: { ...s.temps, [a.fitId]: a.value } };
    case "reason":
      return { ...s, reasons: { ...s.reasons, [a.fitId]: a.value } };
    case "leave-out":
      return { ...s, removed: a.out ? (s.removed.includes(a.fitId) ? s.removed : [...s.removed, a.fitId]) : s.removed.filter((x) => x !== a.fitId) };
  }
}

const decimal = (v: string) => Number(v.replace(",", "."));

/** Has this member's temperature been changed from the one the study uses? */
export function temperatureChanged(e: StudyEdits, m: { fitId: number; temperature_used_c: number | null }): boolean {
  const t = e.temps[m.fitId];
  return t !== undefined && t.trim() !== "" && decimal(t) !== m.temperature_used_c;
}

/** The body of a new version: members kept (with changed temperatures and reasons), the fit added, name, target, why. */
export function studyChangeBody(study: Pick<StudyRecord, "options" | "members">, e: StudyEdits, candidates: ReadonlyArray<{ id: number; label: string }>): ChangeStudy {
  const addId = candidates.find((c) => c.label === e.added)?.id ?? Number(e.added);
  const kept = study.members
    .filter((m) => !e.removed.includes(m.fitId))
    .map((m) =>
      temperatureChanged(e, m)
        ? { fitId: m.fitId, temperature_c: decimal(e.temps[m.fitId]!), temperature_reason: e.reasons[m.fitId] }
        : m.temperature_reason
          ? { fitId: m.fitId, temperature_c: m.temperature_c, temperature_reason: m.temperature_reason }
          : { fitId: m.fitId },
    );
  return {
    reason: e.why,
    name: e.name,
    options: { ...study.options, target_c: decimal(e.target) },
    members: [...kept, ...(Number.isInteger(addId) && addId > 0 ? [{ fitId: addId }] : [])],
  };
}

/** k, t½ and t90 at the target temperature with the 95 % prediction interval, from the study's members. */
export function studyPrediction(study: Pick<StudyRecord, "members">, weighted: boolean, target: string) {
  const points: RatePoint[] = study.members.map((m) => ({ temperatureK: celsiusToKelvin(m.temperature_used_c!), k: m.k, se: weighted ? m.se : null }));
  const c = decimal(target);
  if (!target.trim() || !Number.isFinite(c) || points.length < 3) return null;
  try {
    const p = predictRateConstant(points, celsiusToKelvin(c));
    return { c, ...p, t90: t90(p.k).value, t90pi: [t90(p.pi95[1]).value, t90(p.pi95[0]).value] as [number, number], half: halfLife(p.k).value };
  } catch {
    return null;
  }
}

/** The Eyring line's 95 % band from the same regression on ln(k/T) (its ΔH‡ and ΔS‡ are the stored results). */
export function eyringBandOf(members: ReadonlyArray<{ T: number; k: number; se: number | null }>, weighted: boolean) {
  if (members.length < 3) return [];
  const lo = Math.min(...members.map((m) => m.T)) - 5,
    hi = Math.max(...members.map((m) => m.T)) + 5;
  try {
    return eyringBand(members.map((m) => ({ temperatureK: m.T, k: m.k, se: weighted ? m.se : null })), Array.from({ length: 41 }, (_, i) => lo + ((hi - lo) * i) / 40));
  } catch {
    return [];
  }
}
