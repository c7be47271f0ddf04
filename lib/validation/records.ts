// Validation runs as records: stored with a content hash, signed by the admin who ran them, audited.
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { insertSignature, signaturesOf } from "@/db/queries/reviews";
import { getValidationRun, insertValidationRun, listValidationRuns } from "@/db/queries/validation";
import { recordAudit } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { checkPassword } from "@/lib/reviews";
import type { ValidationReport } from "./index";

/** Stores a finished validation report as a record of the lab, audited as run by the user who asked for it. */
export async function storeValidationReport(db: Knex, user: { labId: number; userId: number }, report: ValidationReport) {
  const json = JSON.stringify(report);
  const hash = createHash("sha256").update(json).digest("hex");
  return db.transaction(async (trx) => {
    const id = await insertValidationRun(trx, { lab_id: user.labId, report: json, all_passed: report.all_passed, passed: report.passed, failed: report.failed, engine_version: report.engine_version, content_hash: hash, run_by: user.userId, run_at: report.started_at });
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: "validation.run", objectType: "validation", objectId: id, newValues: { passed: report.passed, failed: report.failed, content_hash: hash, engine: report.engine_version } });
    return { id, passed: report.passed, failed: report.failed, all_passed: report.all_passed, seconds: report.seconds };
  });
}

export async function getValidationRecord(db: Knex, labId: number, id: number) {
  const row = await getValidationRun(db, labId, id);
  if (!row) throw new AppError({ code: "not_found", message: `There is no validation run ${id} in this lab.` });
  const signatures = await signaturesOf(db, labId, "validation", id);
  return {
    id: row.id,
    run_by: row.run_by_name,
    run_by_id: row.run_by,
    run_at: row.run_at,
    content_hash: row.content_hash,
    report: row.report,
    signatures: signatures.map((s) => ({ printed_name: s.printed_name, meaning: s.meaning, signed_at: s.signed_at, content_hash: s.content_hash, void: s.content_hash !== row.content_hash })),
  };
}
export type ValidationRecord = Awaited<ReturnType<typeof getValidationRecord>>;

/** The admin who ran it signs the run (meaning "reviewed"), password asked again. */
export async function signValidation(db: Knex, user: SignedInUser, id: number, password: string) {
  const rec = await getValidationRecord(db, user.labId, id);
  if (rec.run_by_id !== user.userId) throw new AppError({ code: "forbidden", message: "The administrator who ran the validation signs its report." });
  if (rec.signatures.length) throw new AppError({ code: "conflict", message: "This validation run is already signed." });
  await checkPassword(db, user, password, "validation report", id, "validation");
  const at = new Date().toISOString();
  return db.transaction(async (trx) => {
    await insertSignature(trx, { lab_id: user.labId, object_type: "validation", object_id: id, user_id: user.userId, printed_name: user.name, meaning: "reviewed", content_hash: rec.content_hash, signed_at: at });
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: "validation.signed", objectType: "validation", objectId: id, newValues: { content_hash: rec.content_hash } });
    return { signed_at: at };
  });
}

export async function validationRuns(db: Knex, labId: number) {
  return (await listValidationRuns(db, labId)).map((r) => ({ ...r, all_passed: Boolean(r.all_passed) }));
}
