// Integrity anyone can verify: a record version's content hash is recomputed from what is stored (the series points by
// their SHA-256, the options, the results, the engine version), never compared with itself; raw files are re-hashed;
// signatures are checked against the recomputed hash; the audit trail is verified with its key and head. Reads in
// pages, so a whole lab is checked in bounded memory.
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { idsAfter, signaturesForCheck, storedFitVersion, storedMethodVersion, storedRawFile, storedRawFileOfRun, storedSeriesPoints, storedStudyVersion } from "@/db/queries/integrity";
import { recordAudit, verifyAuditTrail, type AuditVerification } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { fitContentHash, seriesDataSha } from "@/lib/fits";
import { studyContentHash } from "@/lib/studies";
import { readRawBytes } from "@/lib/storage/raw-store";

const sha = (b: string | Buffer) => createHash("sha256").update(b).digest("hex");

export interface RecordIntegrity {
  ok: boolean;
  problems: string[];
}

/** Recomputes one fit version's content hash, data hash and raw file hash from the stored rows. */
export async function verifyFitVersion(db: Knex, labId: number, fitId: number): Promise<RecordIntegrity> {
  const f = await storedFitVersion(db, labId, fitId);
  if (!f) return { ok: false, problems: [`Fit ${fitId} is not in this lab.`] };
  const problems: string[] = [];
  const s = await storedSeriesPoints(db, labId, f.series_id);
  const dataSha = s ? seriesDataSha(s.t_f64, s.y_f64) : null;
  if (!s) problems.push("The series behind this fit is missing.");
  else if (dataSha !== f.data_sha256) problems.push("The stored points behind this fit have changed since it was saved (their SHA-256 differs).");
  let recomputed: string | null = null;
  if (f.options.ok && f.results.ok) recomputed = fitContentHash({ data_sha256: f.data_sha256, options: f.options.value, results: f.results.value, engine: f.engine_version });
  else problems.push("The stored options or results cannot be read.");
  if (recomputed !== null && recomputed !== f.content_hash) problems.push("The stored options or results no longer give the version's content hash: they were changed after saving.");
  const raw = await rawFileOfRun(db, labId, f.run_id);
  if (raw) problems.push(...raw.problems);
  const sigs = await signaturesForCheck(db, labId, "fit", fitId);
  for (const g of sigs)
    if (recomputed !== null && g.content_hash !== recomputed) problems.push(`${g.printed_name}'s signature (${g.meaning}) binds a content hash that the stored version no longer gives.`);
  return { ok: problems.length === 0, problems };
}

async function rawFileOfRun(db: Knex, labId: number, runId: number): Promise<RecordIntegrity | null> {
  const run = await storedRawFileOfRun(db, labId, runId);
  if (!run) return { ok: false, problems: ["The run behind this record is missing."] };
  return verifyRawFile(db, labId, run.raw_file_id);
}

/** Re-hashes a stored raw file's bytes. */
export async function verifyRawFile(db: Knex, labId: number, rawFileId: number): Promise<RecordIntegrity> {
  const r = await storedRawFile(db, labId, rawFileId);
  if (!r) return { ok: false, problems: [`Raw file ${rawFileId} is missing.`] };
  const read = await readRawBytes({ ...r, lab_id: labId });
  return read.ok ? { ok: true, problems: [] } : { ok: false, problems: [read.problem] };
}

export async function verifyMethodVersion(db: Knex, labId: number, id: number): Promise<RecordIntegrity> {
  const m = await storedMethodVersion(db, labId, id);
  if (!m) return { ok: false, problems: [`Method ${id} is not in this lab.`] };
  return sha(m.definition) === m.content_hash ? { ok: true, problems: [] } : { ok: false, problems: ["The stored method definition no longer gives its content hash."] };
}

export async function verifyStudyVersion(db: Knex, labId: number, id: number): Promise<RecordIntegrity> {
  const s = await storedStudyVersion(db, labId, id);
  if (!s) return { ok: false, problems: [`Study ${id} is not in this lab.`] };
  if (!s.members.ok || !s.options.ok || !s.results.ok) return { ok: false, problems: ["The stored study cannot be read."] };
  const h = studyContentHash({ members: s.members.value, options: s.options.value, results: s.results.value, engine: s.engine_version });
  return h === s.content_hash ? { ok: true, problems: [] } : { ok: false, problems: ["The stored study no longer gives its content hash: it was changed after saving."] };
}

export interface LabIntegrity {
  checked_at: string;
  audit: AuditVerification;
  records: { checked: number; failed: Array<{ kind: string; id: number; problems: string[] }> };
  intact: boolean;
}

/** The administrator's integrity check: the audit trail and every record version of the lab, itself audited. */
export async function checkLabIntegrity(db: Knex, admin: SignedInUser, pageSize = 200): Promise<LabIntegrity> {
  const audit = await verifyAuditTrail(db);
  const failed: LabIntegrity["records"]["failed"] = [];
  let checked = 0;
  const kinds: Array<["fits" | "studies" | "methods", (db: Knex, labId: number, id: number) => Promise<RecordIntegrity>]> = [
    ["fits", verifyFitVersion],
    ["studies", verifyStudyVersion],
    ["methods", verifyMethodVersion],
  ];
  for (const [table, verify] of kinds) {
    let after = 0;
    for (;;) {
      const ids = await idsAfter(db, table, admin.labId, after, pageSize);
      for (const id of ids) {
        const r = await verify(db, admin.labId, id);
        checked++;
        if (!r.ok) failed.push({ kind: table, id, problems: r.problems });
        after = id;
      }
      if (ids.length < pageSize) break;
    }
  }
  const result: LabIntegrity = { checked_at: new Date().toISOString(), audit, records: { checked, failed }, intact: audit.intact && failed.length === 0 };
  await recordAudit(db, {
    labId: admin.labId,
    actorUserId: admin.userId,
    action: "integrity.checked",
    newValues: { intact: result.intact, audit_rows: audit.rows, audit_intact: audit.intact, records_checked: checked, records_failed: failed.map((f) => `${f.kind} ${f.id}`) },
  });
  return result;
}
