// The reports of records: what each prints is read here (database, integrity recomputed, the trail), then drawn on a
// worker thread (pdfkit's layout is CPU work; lib/reports/*-pdf.ts draw from plain data).
import type { Knex } from "knex";
import { auditRowsOfObject } from "@/db/queries/audit";
import { verifyFitVersion, verifyStudyVersion } from "@/lib/integrity";
import { getFitRecord, versionsOfRecord } from "@/lib/fits";
import { runJob } from "@/lib/jobs/pool";
import { listComments, reviewStatus } from "@/lib/reviews";
import { getRunDetail, readSeries } from "@/lib/runs";
import { getStudyRecord } from "@/lib/studies";
import type { ValidationRecord } from "@/lib/validation/records";

/** The PDF of one fit record version: read here, drawn on a worker thread (pdfkit's layout is CPU work). */
export async function fitReportPdf(db: Knex, labId: number, labName: string, id: number): Promise<{ name: string; bytes: Uint8Array }> {
  return runJob("fit-report", await fitReportData(db, labId, labName, id));
}

/** Everything the report prints, as plain data that crosses to the worker thread. */
export async function fitReportData(db: Knex, labId: number, labName: string, id: number) {
  const rec = await getFitRecord(db, labId, id);
  const run = await getRunDetail(db, labId, rec.run.id);
  const versions = await versionsOfRecord(db, labId, rec.record_id!);
  const review = await reviewStatus(db, labId, id);
  const comments = await listComments(db, labId, id);
  const audit = await auditRowsOfObject(db, labId, "fit", String(rec.record_id));
  // The stored points and the stored results: nothing is fitted again to print a record.
  const { t, y } = await readSeries(db, labId, rec.run.id, rec.series.id);
  const integrity = await verifyFitVersion(db, labId, id);
  return { labName, rec, run, versions, review, comments, audit, t, y, integrity };
}
export type FitReportData = Awaited<ReturnType<typeof fitReportData>>;

/** The PDF of one study version: read here, drawn on a worker thread (pdfkit's layout is CPU work). */
export async function studyReportPdf(db: Knex, labId: number, labName: string, id: number): Promise<{ name: string; bytes: Uint8Array }> {
  return runJob("study-report", await studyReportData(db, labId, labName, id));
}

/** Everything the report prints, as plain data that crosses to the worker thread. */
export async function studyReportData(db: Knex, labId: number, labName: string, id: number) {
  const st = await getStudyRecord(db, labId, id);
  const review = await reviewStatus(db, labId, id, "study");
  const comments = await listComments(db, labId, id, "study");
  const audit = await auditRowsOfObject(db, labId, "study", String(st.record_id));
  const integrity = await verifyStudyVersion(db, labId, id);
  return { labName, st, review, comments, audit, integrity };
}
export type StudyReportData = Awaited<ReturnType<typeof studyReportData>>;

/** The validation report as PDF, drawn on a worker thread. */
export async function validationReportPdf(rec: ValidationRecord, labName: string): Promise<{ name: string; bytes: Uint8Array }> {
  return runJob("validation-report", { rec, labName });
}

