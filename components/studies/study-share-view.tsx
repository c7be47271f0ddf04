// A study version opened from a share link (a member, or an outside reviewer where the lab allows it): read-only, drawn
// on the server: the results with their units, the Arrhenius and Eyring plots (the same scenes as the PDF), the global
// fit beside the two-stage route, the prediction with its cautions, the members and the signatures.
import { getDb } from "@/db";
import { formatNumber, formatSeconds, formatWithUncertainty } from "@/lib/format/number";
import { sceneToSvg } from "@/lib/reports/fit-plot";
import { ratePlotScene } from "@/lib/reports/rate-plot";
import { reviewStatus } from "@/lib/reviews";
import { getStudyRecord, PREDICTION_CAUTION } from "@/lib/studies";
import type { ReactNode } from "react";


const kj = (v: number | null | undefined) => (v == null ? null : v / 1000);

export async function StudyShareView({ labId, id, banner }: { labId: number; id: number; banner: ReactNode }) {
  const db = await getDb();
  const st = await getStudyRecord(db, labId, id);
  const review = await reviewStatus(db, labId, id, "study");
  const res = st.results;
  return (
    <div className="mx-auto max-w-5xl space-y-6">
      {banner}
      <header>
        <h1 className="text-2xl font-semibold tracking-tight break-words">{st.name}</h1>
        <p className="text-sm text-ink-500">
          Study version {st.version} of {st.versions.length} · saved {st.created_at.slice(0, 16).replace("T", " ")} UTC by {st.author ?? "—"} · review state: {review.state}
        </p>
        <p className="break-all font-mono text-xs text-ink-500">content hash {st.content_hash}</p>
      </header>
      <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Results" data-testid="shared-study-results">
        {res.kind === "temperature" ? (
          <>
            <p className="num font-mono text-xl">Ea = {formatWithUncertainty(kj(res.ea.value), kj(res.ea.se))} kJ mol⁻¹</p>
            <p className="text-sm">
              ΔH‡ = {formatWithUncertainty(kj(res.eyring.dH.value), kj(res.eyring.dH.se))} kJ mol⁻¹ · ΔS‡ = {formatWithUncertainty(res.eyring.dS.value, res.eyring.dS.se)} J mol⁻¹ K⁻¹ · {res.n} rate constants at{" "}
              {res.temperatures ?? res.n} temperatures
            </p>
            {res.global?.available && res.global.ea && (
              <p className="text-sm">
                All curves fitted together: Ea = {formatWithUncertainty(kj(res.global.ea.value), kj(res.global.ea.se))} kJ mol⁻¹
              </p>
            )}
          </>
        ) : (
          <p className="num font-mono text-xl">k2 = {formatWithUncertainty(res.k2.value, res.k2.se)} L mol⁻¹ s⁻¹</p>
        )}
      </section>
      {res.kind === "temperature" && (
        <section className="grid gap-4 lg:grid-cols-2">
          {(["arrhenius", "eyring"] as const).map((kind) => {
            const scene = ratePlotScene(kind, st.members, res.weighted);
            return (
              <figure key={kind} className="rounded-cell bg-paper-raised p-4 shadow-lift" data-testid={`shared-${kind}`}>
                {/* Our own SVG: every text in it is escaped (sceneToSvg). */}
                <div className="w-full overflow-hidden" dangerouslySetInnerHTML={{ __html: sceneToSvg(scene, `${kind === "arrhenius" ? "Arrhenius" : "Eyring"} plot of ${st.name}`) }} />
                <figcaption className="mt-1 text-xs text-ink-700">
                  {scene.legend.points}
                  {scene.legend.line ? `; ${scene.legend.line}` : ""}.
                </figcaption>
              </figure>
            );
          })}
        </section>
      )}
      {res.kind === "temperature" && res.prediction && (
        <section className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label="Prediction">
          <p className="text-sm">
            At {res.prediction.target_c} °C: k = {formatNumber(res.prediction.k, 4)} s⁻¹ (95 % prediction interval {formatNumber(res.prediction.k_pi95[0], 3)} … {formatNumber(res.prediction.k_pi95[1], 3)}), t90{" "}
            {formatSeconds(res.prediction.t90_s)}.
          </p>
          {res.prediction.warning && <p className="mt-2 text-sm text-caution-700">{res.prediction.warning}</p>}
        </section>
      )}
      <p className="text-sm text-ink-700">{PREDICTION_CAUTION}</p>
      <section aria-label="Members">
        <h2 className="mb-2 text-lg font-semibold">Rate constants used</h2>
        <ul className="space-y-1 text-sm">
          {st.members.map((m) => (
            <li key={m.fitId} className="break-words">
              {m.run_name} · {m.fit_title} v{m.fit_version} · k = {formatWithUncertainty(m.k, m.se)} s⁻¹ · {m.temperature_used_c ?? "?"} °C{m.temperature_reason ? ` (${m.temperature_reason})` : ""}
            </li>
          ))}
        </ul>
      </section>
      <section aria-label="Signatures">
        <h2 className="mb-2 text-lg font-semibold">Signatures</h2>
        {review.signatures.length === 0 ? (
          <p className="text-sm text-ink-500">None yet.</p>
        ) : (
          <ul className="space-y-1 text-sm">
            {review.signatures.map((g) => (
              <li key={g.id} className="break-words">
                <strong>{g.printed_name}</strong> · {g.meaning} · {g.signed_at.replace("T", " ").slice(0, 19)} UTC{g.void ? " · VOID: the record no longer matches what was signed" : ""}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
