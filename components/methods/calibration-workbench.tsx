"use client";
// Calibration curves: standards entered as a table (typed, pasted from a spreadsheet, or read from an exported file),
// the line through them with its uncertainties, the residual plot, LOD/LOQ with the σ chosen, the linearity check,
// and inverse prediction of a concentration with its SE. The browser calls the same engine the server runs on save.
import Papa from "papaparse";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { Plot } from "@/components/plot/plot";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Input, Select } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { parseDecimalField } from "@/lib/format/input";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import { calibrate, inversePredict, type Calibration, type CalibrationWeighting, type SigmaSource } from "@/lib/kinetics/quantities";
import { problemText, sendJson } from "@/lib/http/client";

export interface StandardRow {
  concentration: string;
  absorbance: string;
  replicate: string;
}

interface Saved {
  id: number;
  name: string;
  analyte: string;
  concentration_unit: string;
  wavelength_nm: number | null;
  standards: Array<{ concentration: number; absorbance: number; replicate: number }>;
  options: { through_origin: boolean; weighting: CalibrationWeighting; sigma: SigmaSource; blank_sd: number | null };
}

const toNumber = (s: string) => parseDecimalField(s) ?? NaN;

/** Rows of concentration, absorbance[, replicate] from pasted spreadsheet cells or a CSV export; header lines skipped. */
export function readStandards(text: string): { rows: StandardRow[]; problems: string[] } {
  const parsed = Papa.parse<string[]>(text.trim(), { skipEmptyLines: true, delimitersToGuess: ["\t", ";", ",", " "] });
  const rows: StandardRow[] = [];
  const problems: string[] = [];
  parsed.data.forEach((cells, i) => {
    const c = cells.map((x) => x.trim()).filter((x) => x !== "");
    if (c.length === 0) return;
    const nums = c.map(toNumber);
    if (rows.length === 0 && nums.slice(0, 2).some((v) => Number.isNaN(v))) return; // a header line
    if (c.length < 2 || Number.isNaN(nums[0]!) || Number.isNaN(nums[1]!)) {
      problems.push(`Line ${i + 1}: "${cells.join(" ")}" is not a concentration and an absorbance.`);
      return;
    }
    rows.push({ concentration: c[0]!, absorbance: c[1]!, replicate: c[2] && !Number.isNaN(nums[2]!) ? c[2] : "1" });
  });
  if (rows.length === 0 && problems.length === 0) problems.push("No rows of numbers found.");
  return { rows, problems };
}

export function CalibrationWorkbench({ saved, canSave }: { saved?: Saved; canSave: boolean }) {
  const router = useRouter();
  const toast = useToast();
  const readOnly = Boolean(saved);
  const [name, setName] = useState(saved?.name ?? "");
  const [analyte, setAnalyte] = useState(saved?.analyte ?? "");
  const [unit, setUnit] = useState(saved?.concentration_unit ?? "µmol/L");
  const [wavelength, setWavelength] = useState(saved?.wavelength_nm != null ? String(saved.wavelength_nm) : "");
  const [rows, setRows] = useState<StandardRow[]>(
    saved ? saved.standards.map((s) => ({ concentration: String(s.concentration), absorbance: String(s.absorbance), replicate: String(s.replicate) })) : Array.from({ length: 6 }, () => ({ concentration: "", absorbance: "", replicate: "1" })),
  );
  const [paste, setPaste] = useState("");
  const [pasteProblems, setPasteProblems] = useState<string[]>([]);
  const [origin, setOrigin] = useState(saved?.options.through_origin ?? false);
  const [weighting, setWeighting] = useState<CalibrationWeighting>(saved?.options.weighting ?? "none");
  const [sigma, setSigma] = useState<SigmaSource>(saved?.options.sigma ?? "residual");
  const [blankSd, setBlankSd] = useState(saved?.options.blank_sd != null ? String(saved.options.blank_sd) : "");
  const [readings, setReadings] = useState("");
  const [saving, setSaving] = useState(false);

  const standards = useMemo(
    () =>
      rows
        .map((r) => ({ concentration: toNumber(r.concentration), absorbance: toNumber(r.absorbance), replicate: Math.max(1, Math.round(toNumber(r.replicate) || 1)) }))
        .filter((s) => Number.isFinite(s.concentration) && Number.isFinite(s.absorbance)),
    [rows],
  );
  const result = useMemo((): { cal: Calibration } | { error: string } | null => {
    if (standards.length < 3) return null;
    try {
      return { cal: calibrate(standards.map((s) => s.concentration), standards.map((s) => s.absorbance), { throughOrigin: origin, weighting, sigma, blankSd: toNumber(blankSd) || undefined }) };
    } catch (e) {
      return { error: (e as Error).message };
    }
  }, [standards, origin, weighting, sigma, blankSd]);
  const cal = result && "cal" in result ? result.cal : null;
  const prediction = useMemo(() => {
    if (!cal) return null;
    const ys = readings.split(/[\s;]+/).map(toNumber).filter(Number.isFinite);
    return ys.length ? { ...inversePredict(cal, ys), m: ys.length } : null;
  }, [cal, readings]);

  function applyPaste(text: string) {
    const { rows: got, problems } = readStandards(text);
    setPasteProblems(problems);
    if (got.length) {
      setRows(got);
      toast(`${got.length} standards read.`, "info");
    }
  }

  async function save() {
    setSaving(true);
    let body: { id: number };
    try {
      body = await sendJson<{ id: number }>("/api/calibrations", {
        body: { name, analyte, concentration_unit: unit, wavelength_nm: toNumber(wavelength) || null, standards, through_origin: origin, weighting, sigma, blank_sd: toNumber(blankSd) || null },
      });
    } catch (e) {
      toast(problemText(e), "fault");
      return;
    } finally {
      setSaving(false);
    }
    toast("Calibration saved.", "pass");
    router.push(`/methods/calibrations/${body.id}`);
  }

  const xs = standards.map((s) => s.concentration);
  const lo = Math.min(0, ...xs),
    hi = Math.max(...xs, 0) * 1.05;
  return (
    <div className="grid gap-6 xl:grid-cols-[1fr_24rem]">
      <div className="min-w-0 space-y-6">
        <section className="grid gap-4 lg:grid-cols-2">
          <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
            <h2 className="mb-1 text-sm font-semibold text-ink-700">Standards and line</h2>
            <Plot
              label="Calibration standards and the fitted line"
              height={260}
              data={[
                { type: "scatter", mode: "markers", name: "standards", x: xs, y: standards.map((s) => s.absorbance), marker: { size: 8, color: "#1f6f78" } },
                ...(cal ? [{ type: "scatter", mode: "lines", name: "line", x: [lo, hi], y: [cal.intercept + cal.slope * lo, cal.intercept + cal.slope * hi], line: { color: "#d55e00" } }] : []),
              ] as never}
              layout={{ xaxis: { title: { text: `c (${unit})` } }, yaxis: { title: { text: "A (AU)" } }, showlegend: false } as never}
            />
          </div>
          <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
            <h2 className="mb-1 text-sm font-semibold text-ink-700">Residuals</h2>
            <Plot
              label="Calibration residuals"
              height={260}
              data={cal ? ([{ type: "scatter", mode: "markers", name: "residual", x: xs, y: cal.fit.residuals, marker: { size: 8, color: cal.linearity.linear ? "#1f6f78" : "#b35c00" } }] as never) : ([] as never)}
              layout={{ xaxis: { title: { text: `c (${unit})` } }, yaxis: { title: { text: "A − line" }, zeroline: true }, showlegend: false } as never}
            />
          </div>
        </section>

        <section className="rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Calibration result" data-testid="calibration-result">
          <h2 className="mb-3 text-lg font-semibold">Line</h2>
          {!result ? (
            <p className="text-sm text-ink-500">Enter at least three standards.</p>
          ) : "error" in result ? (
            <p role="alert" className="text-sm text-fault-700">{result.error}</p>
          ) : (
            <>
              <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm md:grid-cols-3">
                <Stat label={`Slope (AU per ${unit})`} value={formatWithUncertainty(result.cal.slope, result.cal.seSlope)} testId="cal-slope" />
                <Stat label="Intercept (AU)" value={result.cal.throughOrigin ? "0 (through the origin)" : formatWithUncertainty(result.cal.intercept, result.cal.seIntercept)} testId="cal-intercept" />
                <Stat label="r²" value={result.cal.r2.toFixed(6)} />
                <Stat label="Residual SD (AU)" value={formatNumber(result.cal.residualSd, 4)} />
                <Stat label={`LOD = 3.3σ/S (${unit})`} value={formatNumber(result.cal.lod, 4)} testId="cal-lod" />
                <Stat label={`LOQ = 10σ/S (${unit})`} value={formatNumber(result.cal.loq, 4)} testId="cal-loq" />
                <Stat label="σ used" value={`${formatNumber(result.cal.sigma, 4)} AU (${{ residual: "residual SD", intercept: "SE of the intercept", blank: "SD of blanks" }[result.cal.sigmaSource]})`} />
                <Stat label="Standards / levels" value={`${result.cal.n} / ${result.cal.levels}`} />
                <Stat label="Range" value={`${formatNumber(result.cal.range[0], 4)} to ${formatNumber(result.cal.range[1], 4)} ${unit}`} />
              </dl>
              <p className="mt-3 text-sm">
                Linearity:{" "}
                {result.cal.linearity.linear ? <Badge tone="pass">no curvature or outlying standard found</Badge> : <Badge tone="caution">check the range</Badge>}{" "}
                {result.cal.linearity.quadratic && <span className="text-ink-500">quadratic term F = {result.cal.linearity.quadratic.f.toFixed(2)}, p = {result.cal.linearity.quadratic.p.toPrecision(2)} (Mandel)</span>}
              </p>
              {result.cal.warnings.map((w) => (
                <p key={w} className="mt-2 rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700">{w}</p>
              ))}
              <div className="mt-4 max-w-md">
                <Input label="Readings of an unknown (AU, replicates separated by spaces)" value={readings} onChange={(e) => setReadings(e.target.value)} inputMode="decimal" />
                {prediction && (
                  <p className="num mt-1 text-sm" data-testid="cal-predict">
                    c = {formatWithUncertainty(prediction.value, prediction.se)} {unit} from {prediction.m} reading{prediction.m === 1 ? "" : "s"}
                    {prediction.value < result.cal.loq ? " · below the LOQ: report as not quantifiable" : prediction.value > result.cal.range[1] ? " · above the highest standard: dilute and measure again" : ""}
                  </p>
                )}
              </div>
              <p className="mt-4 text-xs text-ink-500">LOD and LOQ follow ICH Q2(R2) (3.3σ/S and 10σ/S) with the σ shown. Whether a curve is fit for a release or stability decision is for qualified review under your lab&apos;s SOPs and local regulations.</p>
            </>
          )}
        </section>
      </div>

      <aside className="space-y-5" aria-label="Calibration entry">
        <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift" disabled={readOnly}>
          <legend className="px-1 text-sm font-semibold">Curve</legend>
          <Input label="Name" value={name} onChange={(e) => setName(e.target.value)} />
          <Input label="Analyte" value={analyte} onChange={(e) => setAnalyte(e.target.value)} />
          <div className="grid grid-cols-2 gap-3">
            <Input label="Concentration unit" value={unit} onChange={(e) => setUnit(e.target.value)} />
            <Input label="λ (nm)" inputMode="decimal" value={wavelength} onChange={(e) => setWavelength(e.target.value)} />
          </div>
        </fieldset>
        {!readOnly && (
          <fieldset className="space-y-2 rounded-cell bg-paper-raised p-4 shadow-lift">
            <legend className="px-1 text-sm font-semibold">Paste or read a file</legend>
            <label className="block text-sm font-semibold text-ink-700" htmlFor="cal-paste">
              Cells from a spreadsheet: concentration, absorbance, replicate
            </label>
            <textarea id="cal-paste" value={paste} onChange={(e) => setPaste(e.target.value)} rows={5} className="block w-full rounded-cell border border-ink-300 bg-paper-raised px-3 py-2 font-mono text-sm" placeholder={"0\t0.002\t1\n2\t0.176\t1"} />
            <div className="flex flex-wrap items-center gap-2">
              <Button size="sm" variant="secondary" onClick={() => applyPaste(paste)} disabled={!paste.trim()}>
                Use pasted rows
              </Button>
              <label className="cursor-pointer text-sm font-semibold text-quartz-700 underline">
                Read a CSV export…
                <input
                  type="file"
                  accept=".csv,.txt,text/csv,text/plain"
                  className="sr-only"
                  onChange={async (e) => {
                    const f = e.target.files?.[0];
                    if (f) applyPaste(await f.text());
                  }}
                />
              </label>
            </div>
            {pasteProblems.map((p) => (
              <p key={p} role="alert" className="text-sm text-fault-700">{p}</p>
            ))}
          </fieldset>
        )}
        <fieldset className="rounded-cell bg-paper-raised p-4 shadow-lift" disabled={readOnly}>
          <legend className="px-1 text-sm font-semibold">Standards ({standards.length})</legend>
          <table className="w-full text-sm" data-testid="standards">
            <thead>
              <tr className="text-left text-xs text-ink-500">
                <th className="pb-1 font-semibold">c ({unit})</th>
                <th className="pb-1 font-semibold">A (AU)</th>
                <th className="pb-1 font-semibold">Rep.</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {rows.map((r, i) => (
                <tr key={i}>
                  {(["concentration", "absorbance", "replicate"] as const).map((k) => (
                    <td key={k} className="pr-1 pb-1">
                      <input
                        aria-label={`Standard ${i + 1} ${k}`}
                        inputMode="decimal"
                        value={r[k]}
                        onChange={(e) => setRows(rows.map((x, j) => (j === i ? { ...x, [k]: e.target.value } : x)))}
                        className={`h-8 w-full rounded-cell border bg-paper-raised px-2 font-mono ${r[k].trim() !== "" && Number.isNaN(toNumber(r[k])) ? "border-fault-700" : "border-ink-300"}`}
                      />
                    </td>
                  ))}
                  <td className="pb-1">
                    {!readOnly && (
                      <button type="button" aria-label={`Remove standard ${i + 1}`} className="px-1 text-ink-500 hover:text-fault-700" onClick={() => setRows(rows.filter((_, j) => j !== i))}>
                        ×
                      </button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {!readOnly && (
            <Button size="sm" variant="quiet" onClick={() => setRows([...rows, { concentration: "", absorbance: "", replicate: "1" }])}>
              Add a standard
            </Button>
          )}
        </fieldset>
        <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift" disabled={readOnly}>
          <legend className="px-1 text-sm font-semibold">Line and σ</legend>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" checked={origin} onChange={(e) => setOrigin(e.target.checked)} /> Through the origin
          </label>
          <Select label="Weights" value={weighting} onChange={(e) => setWeighting(e.target.value as CalibrationWeighting)} options={[{ value: "none", label: "None (ordinary least squares)" }, { value: "1/x", label: "1/x" }, { value: "1/x2", label: "1/x²" }]} />
          <Select
            label="σ for LOD and LOQ"
            value={sigma}
            onChange={(e) => setSigma(e.target.value as SigmaSource)}
            options={[{ value: "residual", label: "Residual SD of the line" }, { value: "intercept", label: "SE of the intercept" }, { value: "blank", label: "SD of blank measurements" }]}
          />
          {sigma === "blank" && <Input label="SD of the blanks (AU)" inputMode="decimal" value={blankSd} onChange={(e) => setBlankSd(e.target.value)} />}
        </fieldset>
        {!readOnly && canSave && (
          <Button className="w-full" onClick={save} disabled={saving || !cal || name.trim().length < 2 || !analyte.trim()} data-testid="save-calibration">
            {saving ? "Saving…" : "Save calibration"}
          </Button>
        )}
      </aside>
    </div>
  );
}

function Stat({ label, value, testId }: { label: string; value: string; testId?: string }) {
  return (
    <div>
      <dt className="text-xs text-ink-500">{label}</dt>
      <dd className="num font-mono" data-testid={testId}>
        {value}
      </dd>
    </div>
  );
}
