// Methods (versioned), calibrations (immutable), and a run's method.
import { insertedId } from "./ids";
import { pageOf, type PageQuery } from "./paging";
import type { Db } from "@/db";
import type { DbCalibrationRow, DbMethodRow } from "@/db/tables";

export type { PageQuery as ListQuery } from "./paging";

export async function insertCalibration(db: Db, row: Omit<DbCalibrationRow, "id">): Promise<number> {
  const [r] = await db("calibrations").insert(row).returning("id");
  return insertedId(r);
}

export async function getCalibrationRow(db: Db, labId: number, id: number): Promise<(DbCalibrationRow & { author_name: string | null }) | undefined> {
  return db("calibrations as c").leftJoin("users as u", "u.id", "c.author_id").where({ "c.lab_id": labId, "c.id": id }).first("c.*", "u.display_name as author_name");
}

const CALIBRATION_SORTS: Record<string, string> = { created_at: "c.created_at", name: "c.name", analyte: "c.analyte", slope: "c.slope", lod: "c.lod" };

export async function listCalibrationRows(db: Db, labId: number, q: PageQuery) {
  const base = db("calibrations as c").where("c.lab_id", labId);
  if (q.q) base.andWhere((w) => w.whereLike("c.name", `%${q.q}%`).orWhereLike("c.analyte", `%${q.q}%`));
  return pageOf<Pick<DbCalibrationRow, "id" | "name" | "analyte" | "concentration_unit" | "wavelength_nm" | "slope" | "lod" | "loq" | "results" | "created_at"> & { author_name: string | null }>(
    base,
    q,
    { column: CALIBRATION_SORTS[q.sort] ?? "c.created_at", tie: "c.id" },
    (b) => b.leftJoin("users as u", "u.id", "c.author_id").select("c.id", "c.name", "c.analyte", "c.concentration_unit", "c.wavelength_nm", "c.slope", "c.lod", "c.loq", "c.results", "c.created_at", "u.display_name as author_name"),
  );
}

export async function insertMethodVersion(db: Db, row: Omit<DbMethodRow, "id">): Promise<number> {
  const [r] = await db("methods").insert(row).returning("id");
  const id = insertedId(r);
  if (row.record_id === null) await db("methods").where({ id }).update({ record_id: id });
  return id;
}

export async function getMethodRow(db: Db, labId: number, id: number): Promise<(DbMethodRow & { author_name: string | null }) | undefined> {
  return db("methods as m").leftJoin("users as u", "u.id", "m.author_id").where({ "m.lab_id": labId, "m.id": id }).first("m.*", "u.display_name as author_name");
}

/** The newest version of a method record. */
export async function newestMethodVersion(db: Db, labId: number, recordId: number): Promise<DbMethodRow | undefined> {
  return db("methods").where({ lab_id: labId, record_id: recordId }).orderBy("version", "desc").first();
}

export async function listMethodVersionRows(db: Db, labId: number, recordId: number) {
  return db("methods as m")
    .leftJoin("users as u", "u.id", "m.author_id")
    .where({ "m.lab_id": labId, "m.record_id": recordId })
    .orderBy("m.version")
    .select("m.id", "m.version", "m.reason", "m.content_hash", "m.created_at", "u.display_name as author_name");
}

const METHOD_SORTS: Record<string, string> = { created_at: "m.created_at", name: "m.name", analyte: "m.analyte", version: "m.version" };

export async function listLatestMethodRows(db: Db, labId: number, q: PageQuery) {
  const latest = db("methods").where("lab_id", labId).groupBy("record_id").max({ id: "id" });
  const base = db("methods as m").whereIn("m.id", latest);
  if (q.q) base.andWhere((w) => w.whereLike("m.name", `%${q.q}%`).orWhereLike("m.analyte", `%${q.q}%`));
  return pageOf<Pick<DbMethodRow, "id" | "record_id" | "version" | "name" | "analyte" | "definition" | "created_at"> & { author_name: string | null }>(
    base,
    q,
    { column: METHOD_SORTS[q.sort] ?? "m.created_at", tie: "m.id" },
    (b) => b.leftJoin("users as u", "u.id", "m.author_id").select("m.id", "m.record_id", "m.version", "m.name", "m.analyte", "m.definition", "m.created_at", "u.display_name as author_name"),
  );
}

/** Every method record's newest version, for pickers (name and id only). */
export async function methodChoices(db: Db, labId: number): Promise<Array<{ record_id: number; name: string; version: number }>> {
  const latest = db("methods").where("lab_id", labId).groupBy("record_id").max({ id: "id" });
  return db("methods").whereIn("id", latest).orderBy("name").select("record_id", "name", "version") as unknown as Promise<Array<{ record_id: number; name: string; version: number }>>;
}

export async function setRunMethod(db: Db, labId: number, runId: number, methodRecordId: number | null, methodName: string | null): Promise<number> {
  return db("runs").where({ lab_id: labId, id: runId }).update({ method_record_id: methodRecordId, method: methodName });
}
