// Integrity anyone can verify: a record version's content hash is recomputed from what is stored (the series points by
// their SHA-256, the options, the results, the engine version), never compared with itself; raw files are re-hashed;
// signatures are checked against the recomputed hash; the audit trail is verified with its key and head. Reads in
// pages, so a whole lab is checked in bounded memory.
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { recordAudit, verifyAuditTrail, type AuditVerification } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { fitContentHash, seriesDataSha } from "@/lib/fits";
import { studyContentHash } from "@/lib/studies";

const sha = (b: string | Buffer) => createHash("sha256").update(b).digest("hex");

export interface RecordIntegrity {
  ok: boolean;
  problems: string[];
}

/** Recomputes one fit version's content hash, data hash and raw file hash from the stored rows. */
export async function verifyFitVersion(db: Knex, labId: number, fitId: number): Promise<RecordIntegrity> {
  const f = await db("fits").where({ lab_id: labId, id: fitId }).first();
  if (!f) return { ok: false, problems: [`Fit ${fitId} is not in this lab.`] };
  const problems: string[] = [];
  const s = await db("series").where({ lab_id: labId, id: f.series_id }).first("t_f64", "y_f64");
  const dataSha = s ? seriesDataSha(s.t_f64, s.y_f64) : null;
  if (!s) problems.push("The series behind this fit is missing.");
  else if (dataSha !== f.data_sha256) problems.push("The stored points behind this fit have changed since it was saved (their SHA-256 differs).");
  let recomputed: string | null = null;
  try {
    recomputed = fitContentHash({ data_sha256: f.data_sha256, options: JSON.parse(f.options), results: JSON.parse(f.results), engine: f.engine_version });
  } catch {
    problems.push("The stored options or results cannot be read.");
  }
  if (recomputed !== null && recomputed !== f.content_hash) problems.push("The stored options or results no longer give the version's content hash: they were changed after saving.");
  const raw = await rawFileOfRun(db, labId, f.run_id);
  if (raw) problems.push(...raw.problems);
  const sigs = await db("signatures").where({ lab_id: labId, object_type: "fit", object_id: fitId }).select("meaning", "printed_name", "content_hash");
  for (const g of sigs)
    if (recomputed !== null && g.content_hash !== recomputed) problems.push(`${g.printed_name}'s signature (${g.meaning}) binds a content hash that the stored version no longer gives.`);
  return { ok: problems.length === 0, problems };
}

async function rawFileOfRun(db: Knex, labId: number, runId: number): Promise<RecordIntegrity | null> {
  const run = await db("runs").where({ lab_id: labId, id: runId }).first("raw_file_id");
  if (!run) return { ok: false, problems: ["The run behind this record is missing."] };
  return verifyRawFile(db, labId, run.raw_file_id);
}

/** Re-hashes a stored raw file's bytes. */
export async function verifyRawFile(db: Knex, labId: number, rawFileId: number): Promise<RecordIntegrity> {
  const r = await db("raw_files").where({ lab_id: labId, id: rawFileId }).first("bytes", "sha256", "name");
  if (!r) return { ok: false, problems: [`Raw file ${rawFileId} is missing.`] };
  return sha(Buffer.from(r.bytes)) === r.sha256 ? { ok: true, problems: [] } : { ok: false, problems: [`The raw file ${r.name} no longer matches its SHA-256: its bytes were replaced.`] };
}

export async function verifyMethodVersion(db: Knex, labId: number, id: number): Promise<RecordIntegrity> {
  const m = await db("methods").where({ lab_id: labId, id }).first("definition", "content_hash");
  if (!m) return { ok: false, problems: [`Method ${id} is not in this lab.`] };
  return sha(m.definition) === m.content_hash ? { ok: true, problems: [] } : { ok: false, problems: ["The stored method definition no longer gives its content hash."] };
}

export async function verifyStudyVersion(db: Knex, labId: number, id: number): Promise<RecordIntegrity> {
  const s = await db("studies").where({ lab_id: labId, id }).first("members", "options", "results", "engine_version", "content_hash");
  if (!s) return { ok: false, problems: [`Study ${id} is not in this lab.`] };
  const h = studyContentHash({ members: JSON.parse(s.members), options: JSON.parse(s.options), results: JSON.parse(s.results), engine: s.engine_version });
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
  const kinds: Array<[string, (db: Knex, labId: number, id: number) => Promise<RecordIntegrity>]> = [
    ["fits", verifyFitVersion],
    ["studies", verifyStudyVersion],
    ["methods", verifyMethodVersion],
  ];
  for (const [table, verify] of kinds) {
    let after = 0;
    for (;;) {
      const ids = (await db(table).where({ lab_id: admin.labId }).where("id", ">", after).orderBy("id").limit(pageSize).select("id")) as Array<{ id: number }>;
      for (const { id } of ids) {
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
