// Study versions.
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbStudyRow } from "@/db/tables";

export async function insertStudyVersion(db: Db, row: Omit<DbStudyRow, "id">): Promise<number> {
  const [r] = await db("studies").insert(row).returning("id");
  const id = insertedId(r);
  if (row.record_id === null) await db("studies").where({ id }).update({ record_id: id });
  return id;
}

export async function getStudy(db: Db, labId: number, id: number): Promise<(DbStudyRow & { author_name: string | null }) | undefined> {
  return db("studies as s").leftJoin("users as u", "u.id", "s.author_id").where({ "s.lab_id": labId, "s.id": id }).first("s.*", "u.display_name as author_name");
}

export async function listStudyVersions(db: Db, labId: number, recordId: number): Promise<Array<DbStudyRow & { author_name: string | null }>> {
  return db("studies as s").leftJoin("users as u", "u.id", "s.author_id").where({ "s.lab_id": labId, "s.record_id": recordId }).orderBy("s.version").select("s.*", "u.display_name as author_name");
}

export async function listLatestStudies(db: Db, labId: number) {
  const latest = db("studies").where("lab_id", labId).groupBy("record_id").max({ id: "id" });
  return db("studies as s")
    .whereIn("s.id", latest)
    .leftJoin("users as u", "u.id", "s.author_id")
    .orderBy("s.created_at", "desc")
    .select("s.id", "s.record_id", "s.version", "s.name", "s.kind", "s.results", "s.members", "s.created_at", "u.display_name as author_name");
}

/** The fit versions a study may draw rate constants from, with their runs' temperatures. */
export async function fitsForStudy(db: Db, labId: number, fitIds: number[]) {
  if (fitIds.length === 0) return [];
  return db("fits as f")
    .join("runs as r", "r.id", "f.run_id")
    .join("series as s", "s.id", "f.series_id")
    .where("f.lab_id", labId)
    .whereIn("f.id", fitIds)
    .select("f.id", "f.record_id", "f.version", "f.title", "f.k_value", "f.k_se", "f.primary_model", "r.id as run_id", "r.name as run_name", "r.temperature_c", "s.name as series_name");
}
