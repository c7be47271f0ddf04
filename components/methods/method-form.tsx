"use client";
// Writing a method down: what is measured and how it becomes a concentration, how runs are fitted, and the
// acceptance criteria each fit is judged against. Saving a change makes a new version, with a reason.
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Input, Select } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { formatStartValues, parseDecimalField, parseStartValues } from "@/lib/format/input";
import type { Criterion } from "@/lib/kinetics/criteria";
import { DEFAULT_METHOD_MODELS, MODELS } from "@/lib/kinetics/models";
import type { MethodDefinition } from "@/lib/schemas/methods";
import { problemLines, problemText, sendJson } from "@/lib/http/client";

const num = parseDecimalField;

/** Models a method can name: all but those needing a pairing interval, which a method does not record. */
const METHOD_MODELS = MODELS.filter((m) => !m.needsInterval).map((m) => ({ id: m.id, label: m.family === "formula" ? "The method's own formula" : m.label }));

type Kind = Criterion["kind"];
const CRITERIA: Array<{ kind: Kind; name: string; label: string; fields: Array<{ key: "value" | "min" | "max"; label: string; fallback: string; scale?: number }> }> = [
  { kind: "r2_min", name: "Goodness of fit", label: "r² at least", fields: [{ key: "value", label: "r² at least", fallback: "0.995" }] },
  { kind: "runs_z_max", name: "Random residuals", label: "runs test |z| at most", fields: [{ key: "value", label: "runs test |z| at most", fallback: "1.96" }] },
  { kind: "rel_se_k_max", name: "Precision of k", label: "SE(k)/k at most (%)", fields: [{ key: "value", label: "SE(k)/k at most (%)", fallback: "5", scale: 0.01 }] },
  { kind: "min_points", name: "Enough points", label: "points fitted at least", fields: [{ key: "value", label: "points fitted at least", fallback: "20" }] },
  { kind: "absorbance_window", name: "Reading window", label: "readings within", fields: [{ key: "min", label: "readings from (AU)", fallback: "0.1" }, { key: "max", label: "readings to (AU)", fallback: "1.5" }] },
  { kind: "converged", name: "Convergence", label: "the fit converged", fields: [] },
];

export function MethodForm({
  initial,
  calibrations,
  versionOf,
}: {
  initial?: MethodDefinition;
  calibrations: Array<{ id: number; name: string; analyte: string }>;
  /** Saving a new version of this method version. */
  versionOf?: { id: number; version: number };
}) {
  const router = useRouter();
  const toast = useToast();
  const [name, setName] = useState(initial?.name ?? "");
  const [analyte, setAnalyte] = useState(initial?.analyte ?? "");
  const [wavelength, setWavelength] = useState(initial?.wavelength_nm != null ? String(initial.wavelength_nm) : "");
  const [pathLength, setPathLength] = useState(String(initial?.path_length_cm ?? 1));
  const [concKind, setConcKind] = useState<MethodDefinition["concentration"]["kind"]>(initial?.concentration.kind ?? "none");
  const [epsilon, setEpsilon] = useState(initial?.concentration.kind === "beer-lambert" ? String(initial.concentration.epsilon) : "");
  const [calibrationId, setCalibrationId] = useState(initial?.concentration.kind === "calibration" ? String(initial.concentration.calibration_id) : String(calibrations[0]?.id ?? ""));
  const [blankKind, setBlankKind] = useState<MethodDefinition["blank"]["kind"]>(initial?.blank.kind ?? "none");
  const [blankValue, setBlankValue] = useState(initial?.blank.kind === "value" ? String(initial.blank.value) : "");
  const [models, setModels] = useState<string[]>(initial?.models ?? DEFAULT_METHOD_MODELS);
  const [weighting, setWeighting] = useState<"none" | "log">(initial?.weighting ?? "none");
  const [from, setFrom] = useState(initial?.window.from_s != null ? String(initial.window.from_s) : "");
  const [to, setTo] = useState(initial?.window.to_s != null ? String(initial.window.to_s) : "");
  const [customs, setCustoms] = useState(initial?.custom_models.map((m) => ({ name: m.name, formula: m.formula, starts: formatStartValues(m.starts) })) ?? []);
  const [criteria, setCriteria] = useState<Record<Kind, { on: boolean; value: string; min: string; max: string }>>(() => {
    const out = {} as Record<Kind, { on: boolean; value: string; min: string; max: string }>;
    for (const c of CRITERIA) {
      const have = initial?.criteria.find((x) => x.kind === c.kind);
      const f = (key: "value" | "min" | "max") => {
        const spec = c.fields.find((x) => x.key === key);
        if (!spec) return "";
        const v = have && key in have ? (have as unknown as Record<string, number>)[key]! : null;
        return v === null ? spec.fallback : String(spec.scale ? Number((v / spec.scale).toPrecision(6)) : v);
      };
      out[c.kind] = { on: Boolean(have), value: f("value"), min: f("min"), max: f("max") };
    }
    return out;
  });
  const [notes, setNotes] = useState(initial?.notes ?? "");
  const [reason, setReason] = useState("");
  const [saving, setSaving] = useState(false);
  const [errors, setErrors] = useState<string[]>([]);

  function definition() {
    return {
      name,
      analyte,
      wavelength_nm: num(wavelength),
      path_length_cm: num(pathLength) ?? 1,
      concentration: concKind === "beer-lambert" ? { kind: concKind, epsilon: num(epsilon) } : concKind === "calibration" ? { kind: concKind, calibration_id: Number(calibrationId) } : { kind: "none" },
      blank: blankKind === "value" ? { kind: "value", value: num(blankValue) } : { kind: blankKind },
      models,
      weighting,
      window: { from_s: num(from), to_s: num(to) },
      custom_models: customs.map((c) => ({
        name: c.name,
        formula: c.formula,
        starts: parseStartValues(c.starts),
      })),
      criteria: CRITERIA.filter((c) => criteria[c.kind].on).map((c) => {
        const s = criteria[c.kind];
        const out: Record<string, unknown> = { kind: c.kind };
        for (const f of c.fields) out[f.key] = (num(s[f.key]) ?? NaN) * (f.scale ?? 1);
        return out;
      }),
      notes,
    };
  }

  async function save() {
    setSaving(true);
    setErrors([]);
    let body: { id: number; version: number };
    try {
      body = await sendJson<{ id: number; version: number }>(versionOf ? `/api/methods/${versionOf.id}` : "/api/methods", { body: versionOf ? { definition: definition(), reason } : { definition: definition() } });
    } catch (e) {
      const list = problemLines(e, /^definition\./);
      setErrors(list);
      toast(list[0]!, "fault");
      return;
    } finally {
      setSaving(false);
    }
    toast(`Saved as version ${body.version}.`, "pass");
    router.push(`/methods/${body.id}`);
  }

  return (
    <form
      className="grid max-w-5xl gap-6 lg:grid-cols-2"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
        <legend className="px-1 text-sm font-semibold">What is measured</legend>
        <Input label="Method name" value={name} onChange={(e) => setName(e.target.value)} required minLength={2} />
        <Input label="Analyte" value={analyte} onChange={(e) => setAnalyte(e.target.value)} required />
        <div className="grid grid-cols-2 gap-3">
          <Input label="Wavelength (nm)" inputMode="decimal" value={wavelength} onChange={(e) => setWavelength(e.target.value)} />
          <Input label="Path length (cm)" inputMode="decimal" value={pathLength} onChange={(e) => setPathLength(e.target.value)} />
        </div>
        <Select
          label="Concentration from"
          value={concKind}
          onChange={(e) => setConcKind(e.target.value as typeof concKind)}
          options={[
            { value: "none", label: "Fit absorbance (no conversion)" },
            { value: "beer-lambert", label: "Molar absorptivity ε (Beer–Lambert)" },
            { value: "calibration", label: "A calibration curve" },
          ]}
        />
        {concKind === "beer-lambert" && <Input label="ε (L mol⁻¹ cm⁻¹)" inputMode="decimal" value={epsilon} onChange={(e) => setEpsilon(e.target.value)} />}
        {concKind === "calibration" &&
          (calibrations.length ? (
            <Select label="Calibration curve" value={calibrationId} onChange={(e) => setCalibrationId(e.target.value)} options={calibrations.map((c) => ({ value: String(c.id), label: `${c.name} (${c.analyte})` }))} />
          ) : (
            <p className="text-sm text-caution-700">No calibration curves yet: save one under Calibration curves first.</p>
          ))}
        <Select
          label="Blank"
          value={blankKind}
          onChange={(e) => setBlankKind(e.target.value as typeof blankKind)}
          options={[
            { value: "none", label: "No blank correction" },
            { value: "channel", label: "A blank channel, subtracted at upload" },
            { value: "value", label: "A fixed blank absorbance" },
          ]}
        />
        {blankKind === "value" && <Input label="Blank absorbance (AU)" inputMode="decimal" value={blankValue} onChange={(e) => setBlankValue(e.target.value)} />}
      </fieldset>

      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
        <legend className="px-1 text-sm font-semibold">How runs are fitted</legend>
        <div>
          <p className="text-sm font-semibold text-ink-700">Models (the first is the one the criteria judge)</p>
          {METHOD_MODELS.map((m) => (
            <label key={m.id} className="flex items-center gap-2 py-0.5 text-sm">
              <input type="checkbox" checked={models.includes(m.id)} onChange={(e) => setModels(e.target.checked ? [...models, m.id] : models.filter((x) => x !== m.id))} />
              {m.label}
            </label>
          ))}
        </div>
        <Select label="Weighting of the linearized fit" value={weighting} onChange={(e) => setWeighting(e.target.value as "none" | "log")} options={[{ value: "none", label: "None" }, { value: "log", label: "By (y − A∞)²" }]} />
        <div className="grid grid-cols-2 gap-3">
          <Input label="Window from (s)" inputMode="decimal" value={from} onChange={(e) => setFrom(e.target.value)} hint="Empty: from the first reading." />
          <Input label="Window to (s)" inputMode="decimal" value={to} onChange={(e) => setTo(e.target.value)} hint="Empty: to the last reading." />
        </div>
        <div className="space-y-2">
          <p className="text-sm font-semibold text-ink-700">Custom models</p>
          {customs.map((c, i) => (
            <div key={i} className="space-y-2 rounded-cell border border-ink-100 p-2">
              <Input label={`Custom model ${i + 1} name`} value={c.name} onChange={(e) => setCustoms(customs.map((x, j) => (j === i ? { ...x, name: e.target.value } : x)))} />
              <Input label={`Custom model ${i + 1} formula in t (s)`} value={c.formula} onChange={(e) => setCustoms(customs.map((x, j) => (j === i ? { ...x, formula: e.target.value } : x)))} placeholder="a*exp(-k*t) + c" />
              <Input label={`Custom model ${i + 1} start values`} value={c.starts} onChange={(e) => setCustoms(customs.map((x, j) => (j === i ? { ...x, starts: e.target.value } : x)))} placeholder="a=1, k=0.002, c=0.05" hint="Saved only if the formula reads and a test fit to its own curve converges." />
              <Button size="sm" variant="quiet" onClick={() => setCustoms(customs.filter((_, j) => j !== i))}>
                Remove
              </Button>
            </div>
          ))}
          <Button size="sm" variant="secondary" onClick={() => setCustoms([...customs, { name: "", formula: "", starts: "" }])}>
            Add a custom model
          </Button>
        </div>
      </fieldset>

      <fieldset className="space-y-2 rounded-cell bg-paper-raised p-4 shadow-lift lg:col-span-2">
        <legend className="px-1 text-sm font-semibold">Acceptance criteria</legend>
        <p className="text-sm text-ink-500">Every fit of a run with this method shows each ticked criterion as passed or failed, on the fitting page, in the fits list and in reports.</p>
        <div className="grid gap-2 md:grid-cols-2">
          {CRITERIA.map((c) => (
            <div key={c.kind} className="flex flex-wrap items-end gap-3 rounded-cell border border-ink-100 p-2">
              <label className="flex items-center gap-2 text-sm font-semibold">
                <input type="checkbox" checked={criteria[c.kind].on} onChange={(e) => setCriteria({ ...criteria, [c.kind]: { ...criteria[c.kind], on: e.target.checked } })} aria-label={`Use: ${c.label}`} />
                <span className="w-32">{c.name}</span>
              </label>
              {c.fields.map((f) => (
                <div key={f.key} className="w-32">
                  <Input label={f.label} inputMode="decimal" value={criteria[c.kind][f.key]} disabled={!criteria[c.kind].on} onChange={(e) => setCriteria({ ...criteria, [c.kind]: { ...criteria[c.kind], [f.key]: e.target.value } })} />
                </div>
              ))}
            </div>
          ))}
        </div>
      </fieldset>

      <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift lg:col-span-2">
        <legend className="px-1 text-sm font-semibold">Save</legend>
        <label className="block text-sm font-semibold text-ink-700" htmlFor="method-notes">
          Notes for analysts (handling, cautions, references)
        </label>
        <textarea id="method-notes" rows={3} value={notes} onChange={(e) => setNotes(e.target.value)} className="block w-full rounded-cell border border-ink-300 bg-paper-raised px-3 py-2 text-sm" />
        {versionOf && <Input label="Why this new version (required)" value={reason} onChange={(e) => setReason(e.target.value)} required minLength={3} />}
        {errors.length > 0 && (
          <ul role="alert" className="list-disc pl-5 text-sm text-fault-700">
            {errors.map((e) => (
              <li key={e}>{e}</li>
            ))}
          </ul>
        )}
        <Button type="submit" disabled={saving || (Boolean(versionOf) && reason.trim().length < 3)} data-testid="save-method">
          {saving ? "Checking and saving…" : versionOf ? `Save version ${versionOf.version + 1}` : "Save method"}
        </Button>
      </fieldset>
    </form>
  );
}
