"use client";
// The fitting workspace for one series: data and fitted curves, residuals per model, the linearized view, the model
// comparison table, and the controls (window, exclusions with reasons, fixed A∞, weighting, Beer–Lambert). Every
// re-fit runs the same engine the server runs when the fit is saved, in a Web Worker. The page's state is one reducer
// (fit-state.ts, unit-tested); the views are the files beside this one.
import Link from "next/link";
import { usePathname, useRouter } from "next/navigation";
import { useMemo, useReducer, useState } from "react";
import useSWR from "swr";
import { useToast } from "@/components/ui/toast";
import { solutionColour } from "@/lib/colour/wavelength";
import { formatStartValues, parseDecimalField } from "@/lib/format/input";
import { seriesPointsFetcher } from "@/lib/http/fetcher";
import { problemText, sendJson } from "@/lib/http/client";
import { firstOrderRate, localTangentRate } from "@/lib/kinetics/quantities";
import { evaluateCriteria } from "@/lib/kinetics/criteria";
import { DEFAULT_MODELS, fitUnits, MODELS, modelById } from "@/lib/kinetics/models";
import { convertReading, type SeriesFitOptions } from "@/lib/kinetics/workspace";
import type { FitOptions } from "@/lib/schemas/fits";
import type { MethodForRun } from "@/lib/schemas/methods";
import { ComparisonTable } from "./comparison-table";
import { CriteriaPanel } from "./criteria-panel";
import { ExclusionDialog } from "./exclusion-dialog";
import { FitControls } from "./fit-controls";
import { pointsDisplay } from "./fit-display";
import { FitPlots } from "./fit-plots";
import { ExclusionsPanel, RatePanel, SavePanel } from "./fit-side-panels";
import { buildFitOptions, fitReducer, initialFitState } from "./fit-state";
import { useSeriesFit } from "./use-fit";
import type { SavedVersion } from "@/lib/schemas/responses";

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
  t: Float64Array;
  y: Float64Array;
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
  const [s, dispatch] = useReducer(fitReducer, null, () => initialFitState({ run, series, initialModels, from, method, defaultModels: DEFAULT_MODELS, formatStarts: formatStartValues }));
  const [saving, setSaving] = useState(false);
  // The controls' one pure step to options (fit-state.ts, unit-tested against the route's schema).
  const options: FitOptions = useMemo(() => buildFitOptions(s), [s]);
  const { result, busy: stale } = useSeriesFit(points.t, points.y, options as SeriesFitOptions);
  const outcome = result?.outcome ?? null;
  const tScale = s.perMinute ? 60 : 1;

  function setModelList(next: string[]) {
    dispatch({ type: "set", field: "models", value: next });
    const params = new URLSearchParams(window.location.search);
    params.set("models", next.join(","));
    router.replace(`${pathname}?${params}`, { scroll: false });
  }

  const excluded = useMemo(() => new Set(s.exclusions.map((e) => e.index)), [s.exclusions]);
  // One function while the conversion is the same (the plots keep their traces until it changes).
  const conversionKey = JSON.stringify(options.conversion ?? null);
  // eslint-disable-next-line react-hooks/exhaustive-deps -- keyed by the conversion's content, not its identity
  const conv = useMemo(() => (options.conversion ? (v: number) => convertReading(v, options.conversion!) : (v: number) => v), [conversionKey]);
  function onPointClick(index: number) {
    if (excluded.has(index)) {
      dispatch({ type: "restore", index });
      toast(`Point ${index + 1} restored.`, "info");
    } else dispatch({ type: "ask-exclusion", indices: [index] });
  }

  async function save() {
    setSaving(true);
    let body: SavedVersion;
    try {
      body = await sendJson<SavedVersion>("/api/fits", { body: { runId: run.id, seriesId: series.id, title: s.title, options, ...(from ? { previousId: from.id, reason: s.saveReason } : {}) } });
    } catch (e) {
      toast(problemText(e), "fault");
      return;
    } finally {
      setSaving(false);
    }
    toast(body.unchanged ? "Nothing changed: the newest version already holds these options." : `Saved as version ${body.version}.`, "pass");
    router.push(`/fits/${body.id}`);
  }

  const rate = useMemo(() => {
    const at = parseDecimalField(s.rateAt);
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
    return { model, data, line: { x: [tAt - span * 2, tAt + span * 2], y: [yAt + model * span * 2, yAt - model * span * 2] } };
  }, [s.rateAt, outcome, tScale, points]);
  // Until the first fit lands (seconds at a million points) the page is already usable: the points are drawn as that
  // fit will take them, and every control works (a change starts the fit over with the new options).
  const winFrom = options.window?.from ?? null,
    winTo = options.window?.to ?? null;
  const pendingDisplay = useMemo(() => (result ? null : pointsDisplay(points.t, points.y, excluded, { from: winFrom, to: winTo })), [result, points, excluded, winFrom, winTo]);
  const display = result?.display ?? pendingDisplay!;
  const yUnit = fitUnits(outcome?.quantity ?? (options.conversion ? "concentration" : "absorbance"), options.conversion).y;
  const verdict = method && outcome ? evaluateCriteria(outcome, method.criteria, method.models) : null;

  return (
    <div className="grid gap-6 xl:grid-cols-[1fr_22rem]">
      <div className="min-w-0 space-y-6">
        <FitPlots
          points={points}
          outcome={outcome}
          display={display}
          curveModels={CURVE_MODELS}
          tScale={tScale}
          yLabel={!options.conversion ? `A (${yUnit})` : `c (${yUnit})`}
          colour={solutionColour(run.wavelength_nm).hex}
          conv={conv}
          window={{ from: parseDecimalField(s.windowFrom), to: parseDecimalField(s.windowTo) }}
          tangent={rate?.line ?? null}
          selected={s.selected}
          excluded={excluded}
          dispatch={dispatch}
          onPointClick={onPointClick}
        />
        {outcome ? (
          <ComparisonTable outcome={outcome} perMinute={s.perMinute} yUnit={yUnit} stale={stale} />
        ) : (
          <section className="rounded-cell bg-paper-raised p-4 text-sm text-ink-700 shadow-lift" aria-label="Fitting the series" aria-busy="true" data-testid="first-fit">
            Fitting {points.t.length.toLocaleString("en")} points in a background worker… The points are drawn above; the models&apos; numbers, curves and residuals follow.
          </section>
        )}
        <p className="text-xs text-ink-500">
          Fitted in your browser by {engineVersion}
          {result ? ` (${result.where === "worker" ? "in a background worker" : "on the page"}${result.ms !== null ? `, ${result.ms.toFixed(0)} ms` : ""}${stale ? ", re-fitting…" : ""})` : ""}; saving re-runs the same engine on the server and stores its numbers. Shelf-life or release decisions built on
          these numbers are for qualified review under your lab&apos;s SOPs and local regulations.
        </p>
      </div>

      <aside className="space-y-5" aria-label="Fit controls">
        {method && verdict && <CriteriaPanel method={method} verdict={verdict} />}
        <FitControls state={s} dispatch={dispatch} onModels={setModelList} />
        {outcome && <RatePanel state={s} dispatch={dispatch} rate={rate} yUnit={yUnit} />}
        <ExclusionsPanel state={s} dispatch={dispatch} t={points.t} excluded={excluded} />
        {canSave ? <SavePanel state={s} dispatch={dispatch} from={from} saving={saving} onSave={save} /> : <p className="text-sm text-ink-500">Your role can look at fits but not save them.</p>}
      </aside>

      <ExclusionDialog
        pending={s.pending}
        reason={s.reason}
        onReason={(r) => dispatch({ type: "set", field: "reason", value: r })}
        onCancel={() => dispatch({ type: "cancel-exclusion" })}
        onConfirm={() => dispatch({ type: "confirm-exclusion" })}
        point={(i) => ({ t: points.t[i]!, y: points.y[i]! })}
        tScale={tScale}
      />
    </div>
  );
}
