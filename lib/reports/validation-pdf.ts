// The validation report as PDF: installation facts, reference-file hashes, every case, the signature.
import type { ValidationRecord } from "@/lib/validation/records";
import { faceFor, openPdfDocument, printable, type PdfFont } from "./pdf-fonts";

export async function drawValidationReport({ rec, labName }: { rec: ValidationRecord; labName: string }): Promise<{ name: string; bytes: Uint8Array }> {
  const r = rec.report;
  const { doc, bytes: done } = await openPdfDocument({ margin: 40, info: { Title: `Halflight validation run ${rec.id}`, Subject: `content hash ${rec.content_hash}` } });
  const t = (s: string, size = 9, font: PdfFont = "sans") => doc.font(faceFor(font, s)).fontSize(size).text(printable(s));
  t(`Halflight validation run ${rec.id}: ${r.all_passed ? "ALL CASES PASSED" : `${r.failed} CASE(S) FAILED`}`, 15, "bold");
  t(`${labName} · run ${r.started_at.replace("T", " ").slice(0, 19)} UTC by ${rec.run_by} · ${r.passed} passed, ${r.failed} failed in ${r.seconds.toFixed(1)} s`);
  t(`${r.engine_version} · Node ${r.node} · ${r.platform}`);
  t(`Report content hash ${rec.content_hash}`, 8, "mono");
  doc.moveDown(0.5);
  t("Signatures", 11, "bold");
  if (!rec.signatures.length) t("Not signed yet.");
  for (const s of rec.signatures) t(`${s.printed_name} · ${s.meaning.toUpperCase()} · ${s.signed_at.replace("T", " ").slice(0, 19)} UTC · signed hash ${s.content_hash}${s.void ? " · VOID" : ""}`);
  doc.moveDown(0.5);
  t("Reference files (SHA-256)", 11, "bold");
  for (const f of r.reference_files) t(`${f.sha256}  ${f.file}`, 7, "mono");
  doc.moveDown(0.5);
  t("Cases", 11, "bold");
  for (const c of r.cases)
    t(`${c.pass ? "PASS" : "FAIL"}  ${c.id.padEnd(28)} ours ${c.ours === null ? "—" : c.ours.toPrecision(10)}  reference ${c.reference}  LRE ${c.lre === null ? "—" : c.lre.toFixed(1)}  (${c.threshold})`, 7, "mono");
  doc.moveDown(0.5);
  t("Sources: " + [...new Set(r.cases.map((c) => c.source.replace(/, \w+ from start 2$/, "").replace(/, \w+$/, "")))].join("; "), 7);
  doc.end();
  return { name: `halflight-validation-${rec.id}.pdf`, bytes: await done };
}
