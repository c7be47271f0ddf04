"use client";
// The fitting workspace for one series: data and fitted curves, residuals per model, the linearized view, the model
// comparison table, and the controls (window, exclusions with reasons, fixed A∞, weighting, Beer–Lambert). Every
// re-fit runs the same engine the server runs when the fit is saved.
import Link from "next/link";
import { usePathname, useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import useSWR from "swr";
import { Plot } from "@/components/plot/plot";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { Input } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { CHANNEL_PALETTE, solutionColour } from "@/lib/colour/wavelength";
import { formatStartValues, parseDecimalField, parseStartValues } from "@/lib/format/input";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import { fetcher, seriesPointsFetcher } from "@/lib/http/fetcher";
import { firstOrderRate, localTangentRate } from "@/lib/kinetics/quantities";
import { evaluateCriteria, type Criterion } from "@/lib/kinetics/criteria";
import { FORMULA_FUNCTIONS } from "@/lib/kinetics/formula";
import { DEFAULT_MODELS, fitUnits, MODELS, modelById, parameterUnit, perMinuteFactor } from "@/lib/kinetics/models";
import { convertReading, fitSeriesWithOptions, type Conversion, type SeriesFitOptions } from "@/lib/kinetics/workspace";
import type { FitOptions } from "@/lib/schemas/fits";
import type { MethodForRun } from "@/lib/schemas/methods";
import { decimateIndices, decimate } from "@/lib/plot/decimate";
import { buildFitOptions } from "./fit-state";
import { useSeriesFit } from "./use-fit";
import { problemText, sendJson } from "@/lib/http/client";

const num = parseDecimalField;

/**
 * A time entered in the page's own time unit (minutes when the page shows minutes) and kept in seconds: what is typed
 * stays as typed while the field has focus; the options get seconds.
 */
function TimeInput({ label, seconds, scale, hint, onSeconds }: { label: string; seconds: string; scale: number; hint?: string; onSeconds: (s: string) => void }) {
  const [draft, setDraft] = useState<string | null>(null);
  const sec = num(seconds);
  const shown = draft ?? (sec === null ? "" : String(Number((sec / scale).toPrecision(10))));
  return (
    <Input
      label={`${label} (${scale === 60 ? "min" : "s"})`}
      inputMode="decimal"
      value={shown}
      hint={hint}
      onFocus={() => setDraft(shown)}
      onBlur={() => setDraft(null)}
      onChange={(e) => {
        setDraft(e.target.value);
        const v = num(e.target.value);
        onSeconds(v === null ? "" : String(Number((v * scale).toPrecision(12))));
      }}
    />
  );
}

/** Columns of the main plot the decimator fills (about its width in pixels). */
const PLOT_COLUMNS = 900;

const CURVE_MODELS = new Set(MODELS.filter((m) => m.family !== "straight-line").map((m) => m.id));

interface Props {
  run: { id: number; name: string; wavelength_nm: number | null; path_length_cm: number | null; temperature_c: number | null };
  series: { id: number; name: string; points: number; unit: string; quantity: string };
  initialModels: string[] | null;
  from: { id: number; version: number; title: string; options: FitOptions } | null;
  canSave: boolean;
  engineVersion: string;
  /** The run's method (its newest version): starting options, and the criteria each fit is judged against. */
  method: MethodForRun | null;
}


interface Points {
  t: number[];
  y: number[];
}

export function FitWorkspace(props: Props) {
  const { data, error, mutate } = useSWR<Points>(`/api/runs/${props.run.id}/series/${props.series.id}/points`, seriesPointsFetcher);
  return (
    <div>
      <header className="mb-6">
        <p className="text-sm text-ink-500">
          <Link href={`/runs/${props.run.id}`} className="text-quartz-700 hover:underline">
            {props.run.name}
          </Link>{" "}
          · {props.series.name} · {props.series.points.toLocaleString("en")} points
          {props.run.temperature_c != null ? ` · ${props.run.temperature_c} °C` : ""}
        </p>
        <h1 className="text-2xl font-semibold tracking-tight">{props.from ? `${props.from.title}, changing version ${props.from.version}` : "Fit a series"}</h1>
      </header>
      {error ? (
        <div role="alert" className="rounded-cell bg-fault-100 px-4 py-3 text-fault-700">
          The series could not be loaded: {error.message}{" "}
          <button type="button" className="font-semibold underline" onClick={() => mutate()}>
            Try again
          </button>
        </div>
      ) : !data ? (
        <div className="space-y-4" aria-label="Loading the series">
          <div className="h-80 animate-pulse rounded-cell bg-paper-sunk" />
          <div className="h-40 animate-pulse rounded-cell bg-paper-sunk" />
        </div>
      ) : (
        <Workspace {...props} points={data} />
      )}
    </div>
  );
}

function Workspace({ run, series, initialModels, from, canSave, engineVersion, points, method }: Props & { points: Points }) {
  const router = useRouter();
  const pathname = usePathname();
  const toast = useToast();
  const o = from?.options;
  // A new fit starts from the run's method; changing a saved version starts from that version's options.
  const m = o ? null : method;
  const startConv: Conversion | null = o ? (o.conversion ?? null) : (method?.conversion ?? null);
  const [models, setModels] = useState<string[]>(initialModels ?? o?.models ?? m?.models ?? DEFAULT_MODELS);
  const [windowFrom, setWindowFrom] = useState<string>(o?.window?.from != null ? String(o.window.from) : m?.window.from_s != null ? String(m.window.from_s) : "");
  const [windowTo, setWindowTo] = useState<string>(o?.window?.to != null ? String(o.window.to) : m?.window.to_s != null ? String(m.window.to_s) : "");
  const [exclusions, setExclusions] = useState<Array<{ index: number; reason: string }>>(o?.exclusions ?? []);
  const [fixAinf, setFixAinf] = useState<string>(o?.fixed?.ainf != null ? String(o.fixed.ainf) : "");
  const [logWeights, setLogWeights] = useState(o ? Boolean(o.logWeights) : m?.weighting === "log");
  const [interval, setInterval] = useState<string>(o?.interval != null ? String(o.interval) : "");
  const [epsilon, setEpsilon] = useState<string>(startConv?.kind === "beer-lambert" ? String(startConv.epsilon) : "");
  const [pathLength, setPathLength] = useState<string>(startConv?.kind === "beer-lambert" ? String(startConv.pathLengthCm) : String(run.path_length_cm ?? m?.pathLengthCm ?? 1));
  const calibrationConv = startConv?.kind === "calibration" ? startConv : method?.conversion?.kind === "calibration" ? method.conversion : null;
  const [useCalibration, setUseCalibration] = useState(startConv?.kind === "calibration");
  const [perMinute, setPerMinute] = useState(true);
  const [reason, setReason] = useState("");
  const [title, setTitle] = useState(from?.title ?? `${run.name} · ${series.name}`);
  const [saveReason, setSaveReason] = useState("");
  const [saving, setSaving] = useState(false);
  const [formula, setFormula] = useState<string>(o?.formula ?? m?.formula ?? "");
  const [startsText, setStartsText] = useState<string>(formatStartValues(o?.starts ?? m?.starts ?? {}));
  const [selected, setSelected] = useState<number[]>([]);
  /** The points waiting for a reason before they are excluded (one clicked, or a box selection). */
  const [pending, setPending] = useState<number[] | null>(null);
  const [rateAt, setRateAt] = useState<string>("");

  // The controls' one pure step to options (components/fits/fit-state.ts, unit-tested against the route's schema).
  const options: FitOptions = useMemo(
    () => buildFitOptions({ models, formula, startsText, windowFrom, windowTo, exclusions, fixAinf, logWeights, interval, epsilon, pathLength, useCalibration, calibrationConv, startConv }),
    [models, formula, startsText, windowFrom, windowTo, exclusions, fixAinf, logWeights, interval, epsilon, pathLength, useCalibration, calibrationConv, startConv],
  );
  const { result, busy: stale } = useSeriesFit(points.t, points.y, options as SeriesFitOptions);
  const outcome = result?.outcome ?? null;

  const tScale = perMinute ? 60 : 1;
  const tLabel = perMinute ? "t (min)" : "t (s)";
  const conv = (v: number) => (options.conversion ? convertReading(v, options.conversion) : v);
  const colour = solutionColour(run.wavelength_nm).hex;

  function setModelList(next: string[]) {
    setModels(next);
    const params = new URLSearchParams(window.location.search);
    params.set("models", next.join(","));
    router.replace(`${pathname}?${params}`, { scroll: false });
  }

  function onPointClick(index: number) {
    const ex = exclusions.find((e) => e.index === index);
    if (ex) {
      setExclusions(exclusions.filter((e) => e.index !== index));
      toast(`Point ${index + 1} restored.`, "info");
    } else {
      setReason("");
      setPending([index]);
    }
  }

  async function save() {
    setSaving(true);
    let body: { id: number; version: number; unchanged?: boolean };
    try {
      body = await sendJson<{ id: number; version: number; unchanged?: boolean }>("/api/fits", { body: { runId: run.id, seriesId: series.id, title, options, ...(from ? { previousId: from.id, reason: saveReason } : {}) } });
    } catch (e) {
      toast(problemText(e), "fault");
      return;
    } finally {
      setSaving(false);
    }
    toast(body.unchanged ? "Nothing changed: the newest version already holds these options." : `Saved as version ${body.version}.`, "pass");
    router.push(`/fits/${body.id}`);
  }

  const excludedSet = useMemo(() => new Set(exclusions.map((e) => e.index)), [exclusions]);
  const rate = useMemo(() => {
    const at = num(rateAt);
    const fo = outcome?.models.find((m) => m.model === "first-order" && m.result.converged);
    if (at === null || !fo) return null;
    const tAt = at * tScale;
    const p = Object.fromEntries(fo.result.parameters.map((q) => [q.name, q.value!])) as { a0: number; ainf: number; k: number };
    const model = firstOrderRate(p, tAt);
    const span = (points.t.at(-1)! - points.t[0]!) * 0.05;
    let data: { rate: number; se: number; points: number } | null = null;
    try {
      data = localTangentRate(points.t.filter((_, i) => outcome!.included[i]), points.y.filter((_, i) => outcome!.included[i]), tAt, span);
    } catch {
      data = null;
    }
    const yAt = modelById("first-order")!.curve!(Float64Array.of(tAt), p)[0]!;
    return { tAt, model, data, line: { x: [tAt - span * 2, tAt + span * 2], y: [yAt + model * span * 2, yAt - model * span * 2] } };
  }, [rateAt, outcome, tScale, points]);
  // Drawn: at most about three points per plot column of each kind (lib/plot/decimate.ts); fitted: every point.
  const shownSets = useMemo(() => {
    if (!outcome) return null;
    const inc: number[] = [],
      ex: number[] = [],
      out: number[] = [];
    for (let i = 0; i < points.t.length; i++) (outcome.included[i] ? inc : excludedSet.has(i) ? ex : out).push(i);
    const thin = (idx: number[]) => decimateIndices(idx.map((i) => points.t[i]!), idx.map((i) => points.y[i]!), PLOT_COLUMNS).map((j) => idx[j]!);
    return { inc: thin(inc), ex, out: thin(out), total: points.t.length };
  }, [outcome, points, excludedSet]);
  if (!outcome || !shownSets) {
    return (
      <div className="space-y-4" aria-label="Fitting the series" aria-busy="true" data-testid="first-fit">
        <p className="text-sm text-ink-700">Fitting {points.t.length.toLocaleString("en")} points in a background worker…</p>
        <div className="h-80 animate-pulse rounded-cell bg-paper-sunk" />
        <div className="h-40 animate-pulse rounded-cell bg-paper-sunk" />
      </div>
    );
  }
  const { ms, where } = result!;
  const yUnit = fitUnits(outcome.quantity, options.conversion).y;
  const yLabel = outcome.quantity !== "concentration" ? `A (${yUnit})` : `c (${yUnit})`;
  const verdict = method ? evaluateCriteria(outcome, method.criteria, method.models) : null;
  const long = shownSets.inc.length + shownSets.out.length > 1500;
  const incIdx = shownSets.inc,
    exIdx = shownSets.ex,
    outIdx = shownSets.out;
  const thinned = shownSets.inc.length + shownSets.out.length + shownSets.ex.length < shownSets.total;
  const wFrom = num(windowFrom),
    wTo = num(windowTo);
  const linearView = outcome.linearized_view;

  return (
    <div className="grid gap-6 xl:grid-cols-[1fr_22rem]">
      <div className="min-w-0 space-y-6">
        <section className="rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Data and fitted curves">
          <Plot
            label="Data and fitted curves"
            height={340}
            data={[
              {
                type: long ? "scattergl" : "scatter",
                mode: "markers",
                name: "included",
                x: incIdx.map((i) => points.t[i]! / tScale),
                y: incIdx.map((i) => conv(points.y[i]!)),
                customdata: incIdx,
                marker: { color: colour, size: 6 },
              },
              {
                type: "scatter",
                mode: "markers",
                name: "excluded",
                x: exIdx.map((i) => points.t[i]! / tScale),
                y: exIdx.map((i) => conv(points.y[i]!)),
                customdata: exIdx,
                marker: { color: "#5d687c", size: 8, symbol: "x" },
              },
              {
                type: outIdx.length > 2000 ? "scattergl" : "scatter",
                mode: "markers",
                name: "outside the window",
                x: outIdx.map((i) => points.t[i]! / tScale),
                y: outIdx.map((i) => conv(points.y[i]!)),
                customdata: outIdx,
                marker: { color: "#8a94a6", size: 7, symbol: "circle-open" },
              },
              ...outcome.models
                .filter((m) => CURVE_MODELS.has(m.model) && m.result.converged)
                .map((m, i) => {
                  const c = decimate(outcome.curves[m.model]!.t, outcome.curves[m.model]!.fitted, PLOT_COLUMNS);
                  return {
                    type: long ? "scattergl" : "scatter",
                    mode: "lines",
                    name: `${m.model} fit`,
                    x: c.x.map((v) => v / tScale),
                    y: c.y,
                    line: { color: CHANNEL_PALETTE[(i + 1) % CHANNEL_PALETTE.length], width: 2 },
                  };
                }),
              ...(rate
                ? [{ type: "scatter", mode: "lines", name: "tangent (model)", x: rate.line.x.map((v) => v / tScale), y: rate.line.y, line: { color: "#1b2230", dash: "dash", width: 1.5 } }]
                : []),
            ] as never}
            layout={{
              xaxis: { title: { text: tLabel } },
              yaxis: { title: { text: yLabel } },
              shapes:
                wFrom !== null || wTo !== null
                  ? [{ type: "rect", xref: "x", yref: "paper", x0: (wFrom ?? points.t[0]!) / tScale, x1: (wTo ?? points.t.at(-1)!) / tScale, y0: 0, y1: 1, fillcolor: "#d7eef0", opacity: 0.35, line: { width: 0 }, layer: "below" }]
                  : [],
              clickmode: "event",
            } as never}
            onClick={(e) => {
              const pt = e.points?.[0] as { customdata?: unknown } | undefined;
              if (typeof pt?.customdata === "number") onPointClick(pt.customdata);
            }}
            onSelected={(e) => {
              const idx = (e?.points ?? []).map((p) => (p as { customdata?: unknown }).customdata).filter((v): v is number => typeof v === "number");
              setSelected(idx.filter((i) => !excludedSet.has(i)));
            }}
          />
          {selected.length > 0 && (
            <div className="mt-2 flex flex-wrap items-center gap-2 rounded-cell bg-quartz-100 px-3 py-2 text-sm" data-testid="selection-bar">
              <span>{selected.length} point(s) selected</span>
              <Button size="sm" variant="secondary" onClick={() => { setReason(""); setPending(selected); }}>
                Exclude them…
              </Button>
              <Button
                size="sm"
                variant="secondary"
                onClick={() => {
                  const ts = selected.map((i) => points.t[i]!);
                  setWindowFrom(String(Math.min(...ts)));
                  setWindowTo(String(Math.max(...ts)));
                  setSelected([]);
                }}
              >
                Fit only their time range
              </Button>
              <Button size="sm" variant="quiet" onClick={() => setSelected([])}>
                Clear
              </Button>
            </div>
          )}
          <p className="mt-1 text-xs text-ink-500">
            Click a point to exclude it (you will be asked why); click an excluded point (×) to restore it; open rings are outside the fitting window; or use the box-select tool to pick several. {thinned ? `Shown: the first, lowest and highest reading of each plot column (${(incIdx.length + outIdx.length + exIdx.length).toLocaleString("en")} points); fits use all ${points.t.length.toLocaleString("en")}.` : ""}
          </p>
        </section>

        <section className="grid gap-4 lg:grid-cols-2">
          <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
            <h2 className="mb-1 text-sm font-semibold uppercase tracking-wide text-ink-700">Residuals</h2>
            <Plot
              label="Residuals per model"
              height={220}
              data={outcome.models
                .filter((m) => CURVE_MODELS.has(m.model) && m.result.converged)
                .map((m, i) => {
                  const r = decimate(outcome.curves[m.model]!.t, outcome.curves[m.model]!.residuals, PLOT_COLUMNS / 2);
                  return { type: long ? "scattergl" : "scatter", mode: "markers", name: m.model, x: r.x.map((v) => v / tScale), y: r.y, marker: { size: 5, color: CHANNEL_PALETTE[(i + 1) % CHANNEL_PALETTE.length] } };
                }) as never}
              layout={{ xaxis: { title: { text: tLabel } }, yaxis: { title: { text: "y − fitted" }, zeroline: true } } as never}
            />
          </div>
          <div className="rounded-cell bg-paper-raised p-4 shadow-lift">
            <h2 className="mb-1 text-sm font-semibold uppercase tracking-wide text-ink-700">Linearized view</h2>
            {linearView ? (
              <Plot
                label="ln|y − A∞| against time"
                height={220}
                data={[
                  (() => {
                    const v = decimate(linearView.t, linearView.ln, PLOT_COLUMNS / 2);
                    return { type: long ? "scattergl" : "scatter", mode: "markers", name: "ln|y − A∞|", x: v.x.map((q) => q / tScale), y: v.y, marker: { size: 5, color: colour } };
                  })(),
                  { type: "scatter", mode: "lines", name: "line", x: linearView.line.t.map((v) => v / tScale), y: linearView.line.ln, line: { color: "#d55e00" } },
                ] as never}
                layout={{ xaxis: { title: { text: tLabel } }, yaxis: { title: { text: "ln|y − A∞|" } } } as never}
              />
            ) : (
              <p className="text-sm text-ink-500">Add the linearized first-order model to see ln|y − A∞| against t.</p>
            )}
          </div>
        </section>

        <ComparisonTable outcome={outcome} perMinute={perMinute} yUnit={yUnit} stale={stale} />
        <p className="text-xs text-ink-500">
          Fitted in your browser by {engineVersion} ({where === "worker" ? "in a background worker" : "on the page"}{ms !== null ? `, ${ms.toFixed(0)} ms` : ""}
          {stale ? ", re-fitting…" : ""}); saving re-runs the same engine on the server and stores its numbers. Shelf-life or release decisions built on
          these numbers are for qualified review under your lab&apos;s SOPs and local regulations.
        </p>
      </div>

      <aside className="space-y-5" aria-label="Fit controls">
        {method && verdict && (
          <section className="rounded-cell bg-paper-raised p-4 shadow-lift" aria-label="Method criteria" data-testid="criteria-panel">
            <h2 className="text-sm font-semibold">
              Method: {method.name} <span className="font-normal text-ink-500">v{method.version}</span>
            </h2>
            {method.criteria.length === 0 ? (
              <p className="mt-1 text-sm text-ink-500">The method sets no acceptance criteria.</p>
            ) : (
              <>
                <p className="mt-1 text-sm">
                  {verdict.passed ? <Badge tone="pass">all {verdict.results.length} criteria met</Badge> : <Badge tone="fault">{verdict.failed} of {verdict.results.length} not met</Badge>}{" "}
                  <span className="text-ink-500">judging {verdict.model}</span>
                </p>
                <ul className="mt-2 space-y-1 text-sm">
                  {verdict.results.map((r) => (
                    <li key={r.kind} className="flex items-start justify-between gap-2" data-criterion={r.kind} data-pass={r.pass}>
                      <span>
                        {r.label}
                        {r.note && <span className="block text-xs text-ink-500">{r.note}</span>}
                      </span>
                      <span className="num whitespace-nowrap font-mono text-xs">
                        {r.observed ?? "—"} {r.pass ? <Badge tone="pass">pass</Badge> : <Badge tone="fault">fail</Badge>}
                      </span>
                    </li>
                  ))}
                </ul>
              </>
            )}
          </section>
        )}
        <fieldset className="rounded-cell bg-paper-raised p-4 shadow-lift">
          <legend className="px-1 text-sm font-semibold">Models</legend>
          {MODELS.map((m) => (
            <label key={m.id} className="flex items-center gap-2 py-0.5 text-sm">
              <input type="checkbox" checked={models.includes(m.id)} onChange={(e) => setModelList(e.target.checked ? [...models, m.id] : models.filter((x) => x !== m.id))} />
              {m.label}
            </label>
          ))}
          {models.includes("formula") && (
            <div className="mt-2">
              <Input label="Formula in t (seconds)" value={formula} onChange={(e) => setFormula(e.target.value)} placeholder="b1*(1-exp(-b2*t)) + b3" hint={`Standard notation: + − * / ^ and brackets, ${FORMULA_FUNCTIONS.join(", ")}, pi. Every other name is a parameter.`} />
            </div>
          )}
          <div className="mt-2">
            <Input label="Start values (advanced)" value={startsText} onChange={(e) => setStartsText(e.target.value)} placeholder="k=0.002, b1=1" hint="Per second. Built-in models find their own; formulas start at 1." />
          </div>
          {(models.includes("guggenheim") || models.includes("kezdy-swinbourne")) && (
            <div className="mt-2">
              <TimeInput label="Interval for Guggenheim / Kezdy–Swinbourne" seconds={interval} scale={tScale} onSeconds={setInterval} hint="Pairs of readings this far apart (a multiple of their spacing); 2–3 half-lives is usual." />
            </div>
          )}
        </fieldset>
        <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
          <legend className="px-1 text-sm font-semibold">Window and A∞</legend>
          <div className="grid grid-cols-2 gap-3">
            <TimeInput label="From" seconds={windowFrom} scale={tScale} onSeconds={setWindowFrom} />
            <TimeInput label="To" seconds={windowTo} scale={tScale} onSeconds={setWindowTo} />
          </div>
          <Input label="Fix A∞ at (measured)" inputMode="decimal" value={fixAinf} onChange={(e) => setFixAinf(e.target.value)} hint="Empty: A∞ is fitted (and estimated for the linearized view)." />
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" checked={logWeights} onChange={(e) => setLogWeights(e.target.checked)} />
            Weight the linearized fit by (y − A∞)²
          </label>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" checked={perMinute} onChange={(e) => setPerMinute(e.target.checked)} />
            Show times in minutes and k per minute (stored in seconds)
          </label>
        </fieldset>
        <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
          <legend className="px-1 text-sm font-semibold">Concentration</legend>
          {calibrationConv && (
            <label className="flex items-start gap-2 text-sm">
              <input type="checkbox" checked={useCalibration} onChange={(e) => setUseCalibration(e.target.checked)} />
              <span>
                Convert by calibration {calibrationConv.calibrationId}: c = (A − {formatNumber(calibrationConv.intercept, 4)}) / {formatNumber(calibrationConv.slope, 5)} ({calibrationConv.unit})
              </span>
            </label>
          )}
          {!(useCalibration && calibrationConv) && (
            <>
              <Input label="ε (L mol⁻¹ cm⁻¹)" inputMode="decimal" value={epsilon} onChange={(e) => setEpsilon(e.target.value)} hint="Beer–Lambert. Empty: fit absorbance." />
              <Input label="Path length b (cm)" inputMode="decimal" value={pathLength} onChange={(e) => setPathLength(e.target.value)} />
            </>
          )}
        </fieldset>
        <fieldset className="space-y-2 rounded-cell bg-paper-raised p-4 shadow-lift">
          <legend className="px-1 text-sm font-semibold">Rate at a time</legend>
          <Input label={`At t (${perMinute ? "min" : "s"})`} inputMode="decimal" value={rateAt} onChange={(e) => setRateAt(e.target.value)} hint="−dy/dt from the nonlinear first-order fit, and a local straight line through the data (±5 % of the span)." />
          {rate && (
            <p className="num text-sm" data-testid="rate">
              model: {formatNumber(rate.model * (perMinute ? 60 : 1), 4)} {yUnit} {perMinute ? "min⁻¹" : "s⁻¹"}
              <br />
              data: {rate.data ? `${formatWithUncertainty(rate.data.rate * (perMinute ? 60 : 1), rate.data.se * (perMinute ? 60 : 1))} (${rate.data.points} points)` : "too few points near this time"}
            </p>
          )}
        </fieldset>
        <fieldset className="rounded-cell bg-paper-raised p-4 shadow-lift">
          <legend className="px-1 text-sm font-semibold">Excluded points ({exclusions.length})</legend>
          {exclusions.length === 0 ? (
            <p className="text-sm text-ink-500">None. Click a point on the plot to exclude it.</p>
          ) : (
            <ul className="space-y-1 text-sm" data-testid="exclusions">
              {exclusions.map((e) => (
                <li key={e.index} className="flex items-start justify-between gap-2">
                  <span>
                    <span className="font-mono">#{e.index + 1}</span> at {formatNumber(points.t[e.index]! / tScale, 4)} {perMinute ? "min" : "s"}: {e.reason}
                  </span>
                  <button type="button" className="text-quartz-700 underline" onClick={() => setExclusions(exclusions.filter((x) => x.index !== e.index))}>
                    restore
                  </button>
                </li>
              ))}
            </ul>
          )}
          <ExcludeByNumber n={points.t.length} excluded={excludedSet} onPick={(i) => { setReason(""); setPending([i]); }} />
        </fieldset>
        {canSave ? (
          <fieldset className="space-y-3 rounded-cell bg-paper-raised p-4 shadow-lift">
            <legend className="px-1 text-sm font-semibold">Save</legend>
            <Input label="Title" value={title} onChange={(e) => setTitle(e.target.value)} />
            {from && <Input label="Why this new version (required)" value={saveReason} onChange={(e) => setSaveReason(e.target.value)} />}
            <Button onClick={save} disabled={saving || (Boolean(from) && saveReason.trim().length < 3)} className="w-full" data-testid="save-fit">
              {saving ? "Saving…" : from ? `Save version ${from.version + 1}` : "Save fit record"}
            </Button>
            <p className="text-xs text-ink-500">The server re-runs the fit and keeps every version; nothing is overwritten.</p>
          </fieldset>
        ) : (
          <p className="text-sm text-ink-500">Your role can look at fits but not save them.</p>
        )}
      </aside>

      <Dialog
        open={pending !== null}
        onClose={() => setPending(null)}
        title={pending?.length === 1 ? `Exclude point ${pending[0]! + 1}` : `Exclude ${pending?.length ?? 0} selected points`}
      >
        <form
          onSubmit={(e) => {
            e.preventDefault();
            if (!pending || reason.trim().length < 3) return;
            const add = pending.filter((i) => !excludedSet.has(i)).map((index) => ({ index, reason: reason.trim() }));
            setExclusions([...exclusions, ...add].sort((a, b) => a.index - b.index));
            setPending(null);
            setSelected([]);
          }}
          className="space-y-4"
        >
          <p className="text-sm">
            {pending?.length === 1
              ? `t = ${formatNumber(points.t[pending[0]!]! / tScale, 5)} ${perMinute ? "min" : "s"}, y = ${formatNumber(points.y[pending[0]!]!, 5)}. `
              : ""}
            Each point stays in the record, greyed, with your reason.
          </p>
          <Input label="Reason (required)" value={reason} onChange={(e) => setReason(e.target.value)} autoFocus minLength={3} required />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setPending(null)}>
              Cancel
            </Button>
            <Button type="submit" disabled={reason.trim().length < 3}>
              Exclude
            </Button>
          </div>
        </form>
      </Dialog>
    </div>
  );
}

function ExcludeByNumber({ n, excluded, onPick }: { n: number; excluded: Set<number>; onPick: (i: number) => void }) {
  const [v, setV] = useState("");
  const i = Number(v) - 1;
  const ok = Number.isInteger(i) && i >= 0 && i < n && !excluded.has(i);
  return (
    <form
      className="mt-3 flex items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (ok) onPick(i);
      }}
    >
      <div className="flex-1">
        <Input label="Exclude point number" inputMode="numeric" value={v} onChange={(e) => setV(e.target.value)} hint={`1 to ${n}; keyboard alternative to clicking.`} />
      </div>
      <Button type="submit" variant="secondary" disabled={!ok}>
        Exclude…
      </Button>
    </form>
  );
}

type Outcome = ReturnType<typeof fitSeriesWithOptions>;
type ModelRow = Outcome["models"][number];
const dash = (v: number | null | undefined, f: (x: number) => string) => (v === null || v === undefined ? "—" : f(v));
const inTime = (v: { value: number; se: number | null } | null, perMinute: boolean) =>
  v ? `${formatWithUncertainty(v.value / (perMinute ? 60 : 1), v.se === null ? null : v.se / (perMinute ? 60 : 1))} ${perMinute ? "min" : "s"}` : "—";

const STAT_ROWS: Array<[string, (m: ModelRow, perMinute: boolean) => string]> = [
  ["points fitted", (m) => String(m.result.n)],
  ["SSR", (m) => formatNumber(m.result.ssr, 4)],
  ["r²", (m) => dash(m.result.r2, (v) => v.toFixed(5))],
  ["RMSE", (m) => formatNumber(m.result.rmse, 3)],
  ["AICc", (m) => dash(m.result.aicc, (v) => v.toFixed(2))],
  ["Akaike weight", (m) => dash(m.akaikeWeight, (v) => v.toFixed(3))],
  ["runs of residual signs", (m) => dash(m.result.runs, (v) => `${v}${m.result.runs_p !== null ? ` (p ${m.result.runs_p.toFixed(2)})` : ""}`)],
  ["Durbin–Watson", (m) => dash(m.result.durbin_watson, (v) => v.toFixed(2))],
  ["t½", (m, pm) => inTime(m.halfLife, pm)],
  ["t90", (m, pm) => inTime(m.t90, pm)],
];

function ComparisonTable({ outcome, perMinute, yUnit, stale }: { outcome: Outcome; perMinute: boolean; yUnit: string; stale: boolean }) {
  const units = { y: yUnit, t: perMinute ? "min" : "s" };
  const scale = (model: string, name: string) => (perMinute ? perMinuteFactor(model, name) : 1);
  const paramNames = [...new Set(outcome.models.flatMap((m) => m.result.parameters.map((p) => p.name)))];
  return (
    <section className={`rounded-cell bg-paper-raised p-4 shadow-lift ${stale ? "opacity-70" : ""}`} aria-label="Model comparison" aria-busy={stale}>
      <h2 className="mb-2 text-lg font-semibold">Model comparison</h2>
      {outcome.favoured && (
        <p className="mb-3 text-sm" data-testid="favoured">
          <Badge tone="pass">Favoured: {outcome.favoured.model}</Badge> <span className="text-ink-700">{outcome.favoured.why}</span>
        </p>
      )}
      {outcome.notes.map((n) => (
        <p key={n} className="mb-2 rounded-cell bg-caution-100 px-3 py-2 text-sm text-caution-700">
          {n}
        </p>
      ))}
      <div className="relative overflow-x-auto">
        <table className="w-full text-sm" data-testid="comparison">
          <thead>
            <tr className="border-b border-ink-100 text-left text-xs uppercase tracking-wide text-ink-500">
              <th className="py-2 pr-4" scope="col">
                Statistic
              </th>
              {outcome.models.map((m) => (
                <th key={m.model} scope="col" data-model={m.model} className="pr-4 normal-case">
                  <span className="text-sm font-semibold text-ink-900">{m.model}</span>
                  {outcome.favoured?.model === m.model && <Badge tone="pass">favoured</Badge>}
                  {!m.result.converged && <Badge tone="fault">no fit</Badge>}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {paramNames.map((name) => (
              <tr key={name} className="border-b border-ink-100 align-top">
                <th scope="row" className="py-1.5 pr-4 text-left font-mono text-xs font-normal text-ink-700">
                  {name}
                </th>
                {outcome.models.map((m) => {
                  const p = m.result.parameters.find((q) => q.name === name);
                  const f = scale(m.model, name);
                  const unit = parameterUnit(m.model, name, units);
                  return (
                    <td key={m.model} className="num pr-4 font-mono text-xs" data-model={m.model} data-param={name}>
                      {!p ? "" : p.value === null ? "—" : formatWithUncertainty(p.value * f, p.se === null ? null : p.se * f)}
                      {p && p.value !== null && unit ? <span data-unit> {unit}</span> : null}
                      {p?.se_with_calibration !== undefined && <span className="block text-ink-500">SE with calibration ±{formatNumber(p.se_with_calibration * f, 3)}</span>}
                      {p?.held_from ? ` (from ${modelById(p.held_from)?.label.toLowerCase() ?? p.held_from})` : p?.fixed ? " (fixed)" : p?.ci95 ? <span className="block text-ink-500">95 % CI {formatNumber(p.ci95[0] * f, 4)} … {formatNumber(p.ci95[1] * f, 4)}</span> : null}
                    </td>
                  );
                })}
              </tr>
            ))}
            {STAT_ROWS.map(([label, get]) => (
              <tr key={label} className="border-b border-ink-100">
                <th scope="row" className="py-1.5 pr-4 text-left text-xs font-normal text-ink-700">
                  {label}
                </th>
                {outcome.models.map((m) => (
                  <td key={m.model} className="num pr-4 font-mono text-xs">
                    {get(m, perMinute)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {outcome.models.flatMap((m) =>
        [...(m.result.converged ? [] : [m.result.message]), ...m.result.warnings].map((w) => (
          <p key={`${m.model}-${w}`} className="mt-2 text-xs text-caution-700">
            {m.model}: {w}
          </p>
        )),
      )}
      <p className="mt-2 text-xs text-ink-500">
        AICc and Akaike weights compare only models whose sum of squares is in the data&apos;s units (not the straight-line methods, which work in log units or on pairs).
      </p>
    </section>
  );
}
