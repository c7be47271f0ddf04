"use client";
// A study: the Arrhenius and Eyring plots, the results with uncertainties, predictions at a temperature (with their
// cautions), and the members, whose temperatures may be corrected with a reason (a new version). Its edits and the
// steps to what it shows and saves are in study-state.ts (unit-tested); the views are the files beside this one.
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useReducer, useState } from "react";
import { ReviewPanel } from "@/components/reviews/review-panel";
import { ShareLinks } from "@/components/reviews/share-links";
import { buttonLinkClass } from "@/components/ui/button";
import { useToast } from "@/components/ui/toast";
import { formatWithUncertainty } from "@/lib/format/number";
import { KELVIN_OFFSET } from "@/lib/kinetics/constants";
import { celsiusToKelvin } from "@/lib/kinetics/temperature";
import type { StudyRecord } from "@/lib/studies";
import { problemText, sendJson } from "@/lib/http/client";
import { GlobalFitSection } from "./global-fit";
import { MembersTable } from "./members-table";
import { PredictionPanel } from "./prediction-panel";
import { RatePlots } from "./rate-plots";
import { StudyResults } from "./study-results";
import { initialStudyEdits, studyChangeBody, studyEditReducer, studyPrediction } from "./study-state";
import type { SavedVersion } from "@/lib/schemas/responses";

export function StudyView({
  study,
  canWrite,
  demoNote,
  candidates,
  review,
  residualSvg,
  canShare = false,
}: {
  study: StudyRecord;
  canWrite: boolean;
  demoNote: boolean;
  candidates: Array<{ id: number; label: string }>;
  review: { isAuthor: boolean; mayDecide: boolean; maySubmit: boolean };
  /** The global fit's per-run residual panels, drawn on the server. */
  residualSvg: string | null;
  canShare?: boolean;
}) {
  const router = useRouter();
  const toast = useToast();
  const isNewest = study.newest_id === study.id;
  const [edits, dispatch] = useReducer(studyEditReducer, study, initialStudyEdits);
  const [busy, setBusy] = useState(false);
  const weighted = study.results.kind === "temperature" && study.results.weighted;
  const prediction = useMemo(() => (study.results.kind === "temperature" ? studyPrediction(study, weighted, edits.target) : null), [study, weighted, edits.target]);

  if (study.results.kind === "excess") {
    const r = study.results;
    return (
      <div>
        <h1 className="text-2xl font-semibold">{study.name}</h1>
        <p className="num mt-4 font-mono text-2xl">k2 = {formatWithUncertainty(r.k2.value, r.k2.se)} L mol⁻¹ s⁻¹</p>
        <p className="text-sm text-ink-500">Intercept {formatWithUncertainty(r.intercept.value, r.intercept.se)} s⁻¹ (a solvent or reverse path); r² {r.r2.toFixed(5)}.</p>
        <div className="mt-6 space-y-6">
          <GlobalFitSection g={r.global} twoStage={r.k2} residualSvg={residualSvg} />
          <ReviewPanel record={{ type: "study", id: study.id }} {...review} />
          {canShare && <ShareLinks record={{ type: "study", id: study.id }} />}
        </div>
      </div>
    );
  }
  const r = study.results;
  const members = study.members.map((m) => ({ ...m, T: celsiusToKelvin(m.temperature_used_c!) }));

  async function saveChange() {
    setBusy(true);
    let out: SavedVersion;
    try {
      out = await sendJson<SavedVersion>(`/api/studies/${study.id}`, { body: studyChangeBody(study, edits, candidates) });
    } catch (e) {
      return toast(problemText(e), "fault");
    } finally {
      setBusy(false);
    }
    toast(`Saved as version ${out.version}.`, "pass");
    router.push(`/studies/${out.id}`);
  }

  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">{study.name}</h1>
          <p className="text-sm text-ink-500">
            Version {study.version} of {study.versions.length} · {r.n} rate constants at {r.temperatures ?? r.n} temperatures · weighting {r.weighting} · {study.engine_version}
          </p>
          {demoNote && <p className="mt-1 text-sm text-ink-500">Demo lab: these invented runs were generated with Ea = 82 kJ mol⁻¹, so the study shows the method recovering a known value.</p>}
        </div>
        <div className="flex gap-2">
          <a href={`/api/studies/${study.id}/report`} className={buttonLinkClass("secondary", "md", "text-sm")} data-testid="study-pdf">
            PDF report
          </a>
          <a href={`/api/studies/${study.id}/export`} className={buttonLinkClass("secondary", "md", "text-sm")}>
            Study CSV
          </a>
        </div>
      </header>
      {!isNewest && (
        <p className="rounded-cell bg-caution-100 px-4 py-2 text-sm text-caution-700">
          Not the newest version. <Link className="font-semibold underline" href={`/studies/${study.newest_id}`}>Open the newest</Link>.
        </p>
      )}
      <StudyResults r={r} />
      <RatePlots r={r} members={members} />
      <GlobalFitSection g={r.global} twoStage={r.ea} residualSvg={residualSvg} />
      <ReviewPanel record={{ type: "study", id: study.id }} {...review} />
      {canShare && <ShareLinks record={{ type: "study", id: study.id }} />}
      <PredictionPanel target={edits.target} onTarget={(v) => dispatch({ type: "set", field: "target", value: v })} prediction={prediction} />
      <MembersTable study={study} residuals={r.residuals} editable={canWrite && isNewest} edits={edits} dispatch={dispatch} candidates={candidates} busy={busy} onSave={saveChange} />
      <section aria-label="Versions">
        <h2 className="mb-2 text-lg font-semibold">Versions</h2>
        <ol className="space-y-1 text-sm" data-testid="study-versions">
          {study.versions.map((v) => (
            <li key={v.id}>
              <Link className="font-semibold text-quartz-700 hover:underline" href={`/studies/${v.id}`}>
                Version {v.version}
              </Link>{" "}
              · {v.created_at.slice(0, 16).replace("T", " ")} UTC · {v.author ?? "—"}
              {v.reason ? ` · ${v.reason}` : ""}
            </li>
          ))}
        </ol>
      </section>
      <p className="text-xs text-ink-500">Temperatures in kelvin are °C + {KELVIN_OFFSET}; R = 8.314462618 J mol⁻¹ K⁻¹ and kB/h exact (SI 2019).</p>
    </div>
  );
}
