// The PDF report of one study version: its members (which fit version, which temperature and why), the two-stage
// Arrhenius and Eyring results with their plots (±1 SE bars, the line and its 95 % band), the global fit beside them,
// the stored prediction with its cautions, integrity, comments, signatures and the record's audit events in words.
// Drawn on a worker thread from plain data (lib/reports/records.ts reads it): no database code is imported here.
import type { StudyReportData } from "./records";
import { formatNumber, formatSeconds, formatWithUncertainty } from "@/lib/format/number";
import type { StudyGlobal } from "@/lib/studies";
import { PREDICTION_CAUTION } from "@/lib/studies/caution";
import { drawSceneOnPdf, type PdfSurface } from "./fit-plot";
import { printAudit, printComments, printSignatures } from "./pdf-trail";
import { faceFor, openPdfDocument, printable, type PdfFont } from "./pdf-fonts";
import { ratePlotScene, residualPanelsScene } from "./rate-plot";

const kj = (v: number | null | undefined) => (v === null || v === undefined ? null : v / 1000);
const hours = (s: number) => (s >= 86400 * 2 ? `${formatNumber(s / 86400, 3)} d` : formatSeconds(s));


export async function drawStudyReport(data: StudyReportData): Promise<{ name: string; bytes: Uint8Array }> {
  const { labName, st, review, comments, audit, integrity } = data;

  const { doc, bytes: done } = await openPdfDocument({ margin: 48, info: { Title: `${st.name} v${st.version}`, Author: "Halflight", Subject: `content hash ${st.content_hash}` } });
  const line = (text: string, size = 10, kind: PdfFont = "sans") => doc.font(faceFor(kind, text)).fontSize(size).text(printable(text));
  const heading = (text: string) => {
    doc.moveDown(0.6);
    line(text, 12, "bold");
    doc.moveDown(0.2);
  };
  const plot = (title: string, kind: "arrhenius" | "eyring", weighted: boolean) => {
    const scene = ratePlotScene(kind, st.members, weighted);
    // The heading stays with its plot.
    if (doc.y + 330 > doc.page.height - 60) doc.addPage();
    heading(title);
    const top = doc.y + 6;
    doc.font("sans");
    const used = drawSceneOnPdf(doc as unknown as PdfSurface, scene, 44, top, 420, printable);
    doc.fillColor("#1b2230");
    doc.font("sans").fontSize(8).text(printable(`${scene.legend.points} (dots)${scene.legend.line ? `; ${scene.legend.line}` : ""}.`), 48, top + used + 2);
    doc.x = 48;
    doc.y = top + used + 16;
  };

  const residualPanels = (g: StudyGlobal) => {
    const strips = (g.runs ?? []).filter((r) => r.residuals).map((r) => ({ label: r.run_name, t: r.residuals!.t, r: r.residuals!.r }));
    if (!strips.length) return;
    const scene = residualPanelsScene(strips);
    const height = (scene.height * 440) / scene.width;
    if (doc.y + height + 30 > doc.page.height - 60) doc.addPage();
    line("Each run's residuals under the shared law (one scale)", 10, "bold");
    const top = doc.y + 4;
    doc.font("sans");
    const used = drawSceneOnPdf(doc as unknown as PdfSurface, scene, 44, top, 440, printable);
    doc.fillColor("#1b2230");
    doc.x = 48;
    doc.y = top + used + 8;
  };

  line(`Halflight study record: ${st.name}`, 16, "bold");
  line(`Version ${st.version} of ${st.versions.length} · ${labName} · ${st.kind === "temperature" ? "temperature study" : "excess-concentration series"}`, 10);
  line(`Saved ${st.created_at.replace("T", " ").slice(0, 19)} UTC by ${st.author ?? "—"} · review state: ${review.state}${review.superseded_by ? ` (superseded by version ${review.superseded_by.version})` : ""}`, 10);
  line(`Record content hash ${st.content_hash} · ${st.engine_version}`, 8, "mono");
  line(integrity.ok ? "Integrity verified: the content hash recomputed from the stored members, options and results." : `TAMPER WARNING: ${integrity.problems.join(" ")}`, 9, integrity.ok ? "sans" : "bold");

  heading("Rate constants used");
  for (const m of st.members)
    line(
      `${m.run_name} · ${m.series_name} · fit "${m.fit_title}" v${m.fit_version} · k = ${formatWithUncertainty(m.k, m.se)} s⁻¹ · ${m.temperature_used_c ?? "?"} °C${m.temperature_reason ? ` (changed from ${m.run_temperature_c ?? "unrecorded"} °C: ${m.temperature_reason})` : ""}${m.excess_mol_l ? ` · excess ${m.excess_mol_l} mol L⁻¹` : ""}`,
      9,
    );

  const results = st.results;
  if (results.kind === "excess") {
    const r = results;
    heading("Second-order rate constant (two-stage: each run fitted, then k_obs on [B]0)");
    line(`k2 = ${formatWithUncertainty(r.k2.value, r.k2.se)} L mol⁻¹ s⁻¹`, 14, "bold");
    line(`Intercept ${formatWithUncertainty(r.intercept.value, r.intercept.se)} s⁻¹ · r² ${r.r2.toFixed(5)}`, 9);
    const g = r.global;
    heading("All curves fitted together (k_obs = k2·[B]0, k2 shared)");
    if (!g || !g.available) line(g?.reason ? `Not available: ${g.reason}` : "Not computed for this version.", 9);
    else {
      line(`k2 = ${formatWithUncertainty(g.k2?.value ?? null, g.k2?.se ?? null)} L mol⁻¹ s⁻¹ · ${g.n} points, ${g.dof} degrees of freedom · ${g.converged ? "converged" : `not converged: ${g.message}`}`, 10, "bold");
      if (g.agreement) line(`Two-stage minus global k2: ${formatNumber(g.agreement.difference, 3)} L mol⁻¹ s⁻¹${g.agreement.z !== null ? ` (${g.agreement.z.toFixed(2)} combined SE)` : ""}`, 9);
      for (const run of g.runs ?? []) line(`   ${run.run_name}: [B]0 ${run.excess_mol_l ?? "?"} mol L⁻¹, n ${run.n}, k_obs = ${formatWithUncertainty(run.k, run.se_k)} s⁻¹, share of SSR ${run.ssr_share === null ? "—" : `${(run.ssr_share * 100).toFixed(1)} %`}`, 8);
      for (const w of g.warnings ?? []) line(w, 9, "bold");
      residualPanels(g);
    }
  } else {
    const r = results;
    heading("Two-stage result (each run fitted, then Arrhenius on the rate constants)");
    line(`Ea = ${formatWithUncertainty(kj(r.ea.value), kj(r.ea.se))} kJ mol⁻¹`, 14, "bold");
    if (r.ea.ci95) line(`95 % CI ${formatNumber(kj(r.ea.ci95[0]), 4)} … ${formatNumber(kj(r.ea.ci95[1]), 4)} kJ mol⁻¹`, 9);
    line(`ln A = ${formatWithUncertainty(r.lnA.value, r.lnA.se)} (A in s⁻¹)${r.corrEaLnA !== null ? ` · correlation of Ea and ln A ${r.corrEaLnA.toFixed(4)}` : ""} · r² ${r.r2 === null ? "—" : r.r2.toFixed(5)}`, 9);
    line(`Eyring (transmission coefficient 1): ΔH‡ = ${formatWithUncertainty(kj(r.eyring.dH.value), kj(r.eyring.dH.se))} kJ mol⁻¹ · ΔS‡ = ${formatWithUncertainty(r.eyring.dS.value, r.eyring.dS.se)} J mol⁻¹ K⁻¹`, 9);
    line(`${r.n} rate constants at ${r.temperatures ?? r.n} temperatures · weighting ${r.weighting}`, 9);
    for (const q of r.q10) line(`Q10 ${q.from_c.toFixed(1)} → ${q.to_c.toFixed(1)} °C: ${q.q10.toFixed(3)}`, 9);
    for (const w of r.warnings) line(w, 9, "bold");
    plot("Arrhenius plot", "arrhenius", r.weighted);
    plot("Eyring plot", "eyring", r.weighted);

    const g = r.global;
    heading("All curves fitted together (global fit)");
    if (!g || !g.available) line(g?.reason ? `Not available: ${g.reason}` : "Not computed for this version.", 9);
    else {
      line(`Ea = ${formatWithUncertainty(kj(g.ea?.value), kj(g.ea?.se))} kJ mol⁻¹ · kref at ${formatNumber(g.tref_c ?? null, 4)} °C = ${formatWithUncertainty(g.kref?.value ?? null, g.kref?.se ?? null)} s⁻¹`, 10, "bold");
      line(`Correlation of Ea and kref ${g.correlation_ea_kref?.toFixed(3) ?? "—"} · ${g.n} points, ${g.dof} degrees of freedom · ${g.converged ? "converged" : `not converged: ${g.message}`}`, 9);
      if (g.agreement) line(`Two-stage minus global Ea: ${formatNumber(kj(g.agreement.difference), 3)} kJ mol⁻¹${g.agreement.z !== null ? ` (${g.agreement.z.toFixed(2)} combined SE: ${g.agreement.agree ? "they agree within their uncertainties" : "they DISAGREE beyond two combined SE"})` : ""}`, 9);
      for (const run of g.runs ?? [])
        line(`   ${run.run_name}: ${run.temperature_c?.toFixed(1) ?? "?"} °C, n ${run.n}, k = ${formatWithUncertainty(run.k, run.se_k)} s⁻¹, share of SSR ${run.ssr_share === null ? "—" : `${(run.ssr_share * 100).toFixed(1)} %`}, runs test z ${run.runs_z?.toFixed(2) ?? "—"}`, 8);
      for (const w of g.warnings ?? []) line(w, 9, "bold");
      if (g.prediction)
        line(`From the global fit at ${g.prediction.target_c} °C: k = ${formatNumber(g.prediction.k, 4)} s⁻¹ (95 % confidence interval of the mean rate ${formatNumber(g.prediction.ci95[0], 3)} … ${formatNumber(g.prediction.ci95[1], 3)}), t90 ${hours(g.prediction.t90_s)}${g.prediction.extrapolated ? "; extrapolated beyond the measured temperatures" : ""}.`, 9);
      residualPanels(g);
    }

    heading("Prediction at the storage temperature");
    const p = r.prediction;
    if (!p) line("No target temperature was set for this version (or fewer than three rate constants).", 9);
    else {
      line(`At ${p.target_c} °C: k = ${formatNumber(p.k, 4)} s⁻¹ (95 % prediction interval ${formatNumber(p.k_pi95[0], 3)} … ${formatNumber(p.k_pi95[1], 3)}); t½ ${hours(p.half_life_s)}; t90 ${hours(p.t90_s)} (${hours(p.t90_pi95_s[0])} … ${hours(p.t90_pi95_s[1])})`, 10, "bold");
      if (p.extrapolated) line(`Extrapolated ${p.extrapolation_c.toFixed(1)} °C beyond the measured temperatures.`, 9, "bold");
      if (p.warning) line(p.warning, 9);
    }
  }
  line(PREDICTION_CAUTION, 9);

  printComments(line, heading, comments);
  printSignatures(line, heading, review.signatures);
  heading("Versions");
  for (const v of st.versions) line(`Version ${v.version}, ${v.created_at.replace("T", " ").slice(0, 16)} UTC, ${v.author ?? "—"}${v.reason ? `: ${v.reason}` : ""}`, 9);
  printAudit(line, heading, audit);
  doc.end();
  return { name: `study-${st.record_id}-v${st.version}.pdf`, bytes: await done };
}
