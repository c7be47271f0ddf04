// Reads for the integrity check: exactly what is stored, JSON columns parsed as any JSON (a changed value is what the
// check looks for, so no shape is imposed on it here), raw bytes as bytes.
import type { Db } from "@/db";
import { anyJson, readJson } from "@/db/json";

type Parsed = { ok: true; value: unknown } | { ok: false };
function parsed(text: string, what: string): Parsed {
  try {
    return { ok: true, value: readJson(anyJson, text, what) };
  } catch {
    return { ok: false };
  }
}

export async function storedFitVersion(db: Db, labId: number, id: number) {
  const f: { run_id: number; series_id: number; data_sha256: string; options: string; results: string; engine_version: string; content_hash: string } | undefined = await db("fits")
    .where({ lab_id: labId, id })
    .first("run_id", "series_id", "data_sha256", "options", "results", "engine_version", "content_hash");
  return f && { ...f, options: parsed(f.options, `options of fit ${id}`), results: parsed(f.results, `results of fit ${id}`) };
}

export async function storedSeriesPoints(db: Db, labId: number, id: number): Promise<{ t_f64: Buffer; y_f64: Buffer } | undefined> {
  return db("series").where({ lab_id: labId, id }).first("t_f64", "y_f64");
}

export async function storedRawFileOfRun(db: Db, labId: number, runId: number): Promise<{ raw_file_id: number } | undefined> {
  return db("runs").where({ lab_id: labId, id: runId }).first("raw_file_id");
}

export async function storedRawFile(db: Db, labId: number, id: number): Promise<{ bytes: Buffer; sha256: string; name: string; stored_in: string } | undefined> {
  return db("raw_files").where({ lab_id: labId, id }).first("bytes", "sha256", "name", "stored_in");
}

export async function signaturesForCheck(db: Db, labId: number, objectType: string, objectId: number): Promise<Array<{ meaning: string; printed_name: string; content_hash: string }>> {
  return db("signatures").where({ lab_id: labId, object_type: objectType, object_id: objectId }).select("meaning", "printed_name", "content_hash");
}

/** A method version's definition as stored text (its content hash is the SHA-256 of that text). */
export async function storedMethodVersion(db: Db, labId: number, id: number): Promise<{ definition: string; content_hash: string } | undefined> {
  return db("methods").where({ lab_id: labId, id }).first("definition", "content_hash");
}

export async function storedStudyVersion(db: Db, labId: number, id: number) {
  const s: { members: string; options: string; results: string; engine_version: string; content_hash: string } | undefined = await db("studies")
    .where({ lab_id: labId, id })
    .first("members", "options", "results", "engine_version", "content_hash");
  return s && { ...s, members: parsed(s.members, `members of study ${id}`), options: parsed(s.options, `options of study ${id}`), results: parsed(s.results, `results of study ${id}`) };
}

/** One page of a table's ids in a lab, after `after` (the check walks every version in pages). */
export async function idsAfter(db: Db, table: "fits" | "studies" | "methods", labId: number, after: number, limit: number): Promise<number[]> {
  const rows: Array<{ id: number }> = await db(table).where({ lab_id: labId }).where("id", ">", after).orderBy("id").limit(limit).select("id");
  return rows.map((r) => r.id);
}
