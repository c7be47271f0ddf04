// The PDF report of one fit record version (pdfkit): lab, run and file identity, the plot, parameters and diagnostics,
// exclusions with reasons, versions, comments, signature blocks and the record's audit events, in the app's own
// typefaces (lib/reports/pdf-fonts.ts) so units and symbols print as on screen.
// Drawn on a worker thread from plain data (lib/reports/records.ts reads it): no database code is imported here, and
// pdfkit loads on the first report, so the worker starts light.
import type { FitReportData } from "./records";
import { fitUnits, parameterUnit } from "@/lib/kinetics";
import { formatNumber, formatWithUncertainty } from "@/lib/format/number";
import { drawSceneOnPdf, fitPlotScene, plotAxisLabel, type PdfSurface } from "./fit-plot";
import { printAudit, printComments, printSignatures } from "./pdf-trail";
import { faceFor, openPdfDocument, printable, type PdfFont } from "./pdf-fonts";


export async function drawFitReport(data: FitReportData): Promise<{ name: string; bytes: Uint8Array }> {
  const { labName, rec, run, versions, review, comments, audit, t, y, integrity } = data;

  const { doc, bytes: done } = await openPdfDocument({ margin: 48, info: { Title: `${rec.title} v${rec.version}`, Author: "Halflight", Subject: `content hash ${rec.content_hash}` } });
  const font = (kind: PdfFont) => doc.font(kind);
  const line = (text: string, size = 10, kind: PdfFont = "sans") => font(faceFor(kind, text)).fontSize(size).text(printable(text));
  const heading = (text: string) => {
    doc.moveDown(0.6);
    line(text, 12, "bold");
    doc.moveDown(0.2);
  };

  line(`Halflight fit record: ${rec.title}`, 16, "bold");
  line(`Version ${rec.version} of ${versions.length} · ${labName}`, 10);
  line(`Saved ${rec.created_at.replace("T", " ").slice(0, 19)} UTC by ${rec.author ?? "—"} · review state: ${review.state}${review.superseded_by ? ` (superseded by version ${review.superseded_by.version})` : ""}`, 10);
  doc.moveDown(0.4);
  line(`Run: ${run.name} · series ${rec.series.name} · ${run.wavelength_nm ?? "?"} nm · ${run.path_length_cm ?? "?"} cm · ${run.temperature_c ?? "?"} °C · method ${run.method ?? "not given"}`, 9);
  line(`Raw file: ${run.raw_file.name} · SHA-256 ${run.raw_file.sha256}`, 8, "mono");
  line(`Data SHA-256 ${rec.data_sha256}`, 8, "mono");
  line(`Record content hash ${rec.content_hash} · ${rec.engine_version}`, 8, "mono");
  line(integrity.ok ? "Integrity verified: content hash, data and raw file SHA-256 recomputed from what is stored." : `TAMPER WARNING: ${integrity.problems.join(" ")}`, 9, integrity.ok ? "sans" : "bold");

  heading(`Rate constant (${rec.primary.model})`);
  const units = fitUnits(rec.results.quantity, rec.options.conversion);
  const recordParameterUnit = (model: string, param: string, u: typeof units) => parameterUnit(model, param, u) ?? "";
  line(`k = ${formatWithUncertainty(rec.primary.k, rec.primary.k_se)} ${recordParameterUnit(rec.primary.model, "k", units)}`, 14, "bold");

  // The plot: the same scene as the record page (data, the fitted curve, residuals below), drawn as vectors.
  const scene = fitPlotScene({ t, y, options: rec.options, results: rec.results, model: rec.primary.model, yUnit: plotAxisLabel(rec.results.quantity, units.y) });
  const top = doc.y + 6;
  font("sans");
  const used = drawSceneOnPdf(doc as unknown as PdfSurface, scene, 44, top, 500, printable);
  doc.fillColor("#1b2230");
  font("sans").fontSize(8).text(printable(`${scene.legend.points} (dots)${scene.legend.outside ? `; ${scene.legend.outside} (rings)` : ""}${scene.legend.line ? `; ${scene.legend.line} (line)` : ""}. Residuals = reading - curve.`), 48, top + used + 2);
  doc.x = 48;
  doc.y = top + used + 16;

  const ev = rec.results.method_evaluation;
  if (ev) {
    heading(`Method criteria: ${ev.results.length === 0 ? "none set" : ev.passed ? "all met" : `${ev.failed} of ${ev.results.length} NOT MET`}`);
    line(`Judged at save by ${ev.method.name} version ${ev.method.version} on the ${ev.model} fit.`, 9);
    for (const r of ev.results) line(`${r.pass ? "PASS" : "FAIL"}   ${r.label}: ${r.observed ?? "not evaluable"}${r.note ? ` (${r.note})` : ""}`, 9);
  }

  heading("Parameters and diagnostics");
  for (const m of rec.results.models) {
    line(`${m.model}: n ${m.result.n}, dof ${m.result.dof}, SSR ${formatNumber(m.result.ssr, 4)}, r² ${m.result.r2?.toFixed(5) ?? "—"}, AICc ${m.result.aicc?.toFixed(2) ?? "—"}, runs ${m.result.runs ?? "—"}, Durbin–Watson ${m.result.durbin_watson?.toFixed(2) ?? "—"}`, 9, "bold");
    for (const p of m.result.parameters)
      line(`   ${p.name} = ${p.value === null ? (m.result.converged ? "not given" : "no fit") : `${formatWithUncertainty(p.value, p.se)} ${recordParameterUnit(m.model, p.name, units)}`.trimEnd()}${p.held_from ? ` (from ${p.held_from})` : p.fixed ? " (fixed)" : p.ci95 ? `   95 % CI ${formatNumber(p.ci95[0], 5)} … ${formatNumber(p.ci95[1], 5)}` : ""}${p.se_with_calibration !== undefined ? `   SE with calibration ${formatNumber(p.se_with_calibration, 3)}` : ""}`, 9);
    if (!m.result.converged) line(`   ${m.result.message}`, 9);
    for (const w of m.result.warnings) line(`   ${w}`, 8);
  }
  for (const n of rec.results.notes) line(n, 9);

  heading("What was done");
  line(`Models: ${rec.options.models.join(", ")}`, 9);
  const c = rec.options.conversion;
  if (c) line(c.kind === "beer-lambert" ? `Beer–Lambert: ε ${c.epsilon} L mol⁻¹ cm⁻¹, b ${c.pathLengthCm} cm` : `Calibration ${c.calibrationId}: c = (A − ${formatNumber(c.intercept, 5)}) / ${formatNumber(c.slope, 6)} (${c.unit})`, 9);
  if (rec.options.window) line(`Window: ${rec.options.window.from ?? "start"} to ${rec.options.window.to ?? "end"} s`, 9);
  for (const [k, v] of Object.entries(rec.options.fixed ?? {})) line(`${k} fixed at ${v}`, 9);
  for (const e of rec.options.exclusions ?? []) line(`Point ${e.index + 1} (t = ${formatNumber(t[e.index], 5)} s) excluded: ${e.reason}`, 9);
  if (!(rec.options.exclusions ?? []).length) line("No point excluded.", 9);

  heading("Versions");
  for (const v of versions) line(`Version ${v.version}, ${v.created_at.replace("T", " ").slice(0, 16)} UTC, ${v.author ?? "—"}${v.reason ? `: ${v.reason}` : ""} (${v.changes.join("; ")})`, 9);

  printComments(line, heading, comments);
  printSignatures(line, heading, review.signatures);
  printAudit(line, heading, audit);

  doc.moveDown(0.8);
  line("An estimate for qualified review: shelf-life and release decisions follow the lab's SOPs and local regulations.", 8);
  doc.end();
  return { name: `fit-${rec.record_id}-v${rec.version}.pdf`, bytes: await done };
}
