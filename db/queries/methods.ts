// Methods (versioned), calibrations (immutable), and a run's method.
import { insertedId } from "./ids";
import { pageOf, type PageQuery } from "./paging";
import type { Db } from "@/db";
import type { DbCalibrationRow, DbMethodRow } from "@/db/tables";
import { objectWith, readJson } from "@/db/json";
import type { CalibrationResults } from "@/lib/methods";
import { methodDefinitionSchema, standardSchema, type MethodDefinition, type Standard } from "@/lib/schemas/methods";
import { z } from "zod";

const calibrationOptions = z.object({ through_origin: z.boolean(), weighting: z.enum(["none", "1/x", "1/x2"]), sigma: z.enum(["residual", "intercept", "blank"]), blank_sd: z.number().nullable() });
const calibrationResults = objectWith<CalibrationResults>("slope", "se_slope", "intercept", "r2", "n", "linearity");

/** A calibration as read: standards, options and results parsed and checked. */
export type CalibrationRow = Omit<DbCalibrationRow, "standards" | "options" | "results"> & { standards: Standard[]; options: z.infer<typeof calibrationOptions>; results: CalibrationResults };
/** A method version as read: its definition parsed by the schema that accepted it. */
export type MethodRow = Omit<DbMethodRow, "definition"> & { definition: MethodDefinition };

const decodeMethod = <R extends DbMethodRow>(r: R): Omit<R, "definition"> & MethodRow => ({ ...r, definition: readJson(methodDefinitionSchema, r.definition, `definition of method ${r.id}`) });

export type { PageQuery as ListQuery } from "./paging";

export async function insertCalibration(db: Db, row: Omit<DbCalibrationRow, "id">): Promise<number> {
  const [r] = await db("calibrations").insert(row).returning("id");
  return insertedId(r);
}

export async function getCalibrationRow(db: Db, labId: number, id: number): Promise<(CalibrationRow & { author_name: string | null }) | undefined> {
  const r: (DbCalibrationRow & { author_name: string | null }) | undefined = await db("calibrations as c").leftJoin("users as u", "u.id", "c.author_id").where({ "c.lab_id": labId, "c.id": id }).first("c.*", "u.display_name as author_name");
  if (!r) return undefined;
  const what = `calibration ${r.id}`;
  return { ...r, standards: readJson(z.array(standardSchema), r.standards, `standards of ${what}`), options: readJson(calibrationOptions, r.options, `options of ${what}`), results: readJson(calibrationResults, r.results, `results of ${what}`) };
}

const CALIBRATION_SORTS: Record<string, string> = { created_at: "c.created_at", name: "c.name", analyte: "c.analyte", slope: "c.slope", lod: "c.lod" };

export async function listCalibrationRows(db: Db, labId: number, q: PageQuery) {
  const base = db("calibrations as c").where("c.lab_id", labId);
  if (q.q) base.andWhere((w) => w.whereLike("c.name", `%${q.q}%`).orWhereLike("c.analyte", `%${q.q}%`));
  const page = await pageOf<Pick<DbCalibrationRow, "id" | "name" | "analyte" | "concentration_unit" | "wavelength_nm" | "slope" | "lod" | "loq" | "results" | "created_at"> & { author_name: string | null }>(
    base,
    q,
    { column: CALIBRATION_SORTS[q.sort] ?? "c.created_at", tie: "c.id" },
    (b) => b.leftJoin("users as u", "u.id", "c.author_id").select("c.id", "c.name", "c.analyte", "c.concentration_unit", "c.wavelength_nm", "c.slope", "c.lod", "c.loq", "c.results", "c.created_at", "u.display_name as author_name"),
  );
  return { ...page, rows: page.rows.map((r) => ({ ...r, results: readJson(calibrationResults, r.results, `results of calibration ${r.id}`) })) };
}

export async function insertMethodVersion(db: Db, row: Omit<DbMethodRow, "id">): Promise<number> {
  const [r] = await db("methods").insert(row).returning("id");
  const id = insertedId(r);
  if (row.record_id === null) await db("methods").where({ id }).update({ record_id: id });
  return id;
}

export async function getMethodRow(db: Db, labId: number, id: number): Promise<(MethodRow & { author_name: string | null }) | undefined> {
  const r: (DbMethodRow & { author_name: string | null }) | undefined = await db("methods as m").leftJoin("users as u", "u.id", "m.author_id").where({ "m.lab_id": labId, "m.id": id }).first("m.*", "u.display_name as author_name");
  return r && decodeMethod(r);
}

/** The newest version of a method record. */
export async function newestMethodVersion(db: Db, labId: number, recordId: number): Promise<MethodRow | undefined> {
  const r: DbMethodRow | undefined = await db("methods").where({ lab_id: labId, record_id: recordId }).orderBy("version", "desc").first();
  return r && decodeMethod(r);
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
  const page = await pageOf<Pick<DbMethodRow, "id" | "record_id" | "version" | "name" | "analyte" | "definition" | "created_at"> & { author_name: string | null }>(
    base,
    q,
    { column: METHOD_SORTS[q.sort] ?? "m.created_at", tie: "m.id" },
    (b) => b.leftJoin("users as u", "u.id", "m.author_id").select("m.id", "m.record_id", "m.version", "m.name", "m.analyte", "m.definition", "m.created_at", "u.display_name as author_name"),
  );
  return { ...page, rows: page.rows.map((r) => ({ ...r, definition: readJson(methodDefinitionSchema, r.definition, `definition of method ${r.id}`) })) };
}

/** Every method record's newest version, for pickers (name and id only). */
export async function methodChoices(db: Db, labId: number): Promise<Array<{ record_id: number; name: string; version: number; wavelength_nm: number | null }>> {
  const latest = db("methods").where("lab_id", labId).groupBy("record_id").max({ id: "id" });
  const rows: Array<{ id: number; record_id: number; name: string; version: number; definition: string }> = await db("methods").whereIn("id", latest).orderBy("name").select("id", "record_id", "name", "version", "definition");
  return rows.map((r) => ({ record_id: r.record_id, name: r.name, version: r.version, wavelength_nm: readJson(methodDefinitionSchema, r.definition, `definition of method ${r.id}`).wavelength_nm }));
}

export async function setRunMethod(db: Db, labId: number, runId: number, methodRecordId: number | null, methodName: string | null): Promise<number> {
  return db("runs").where({ lab_id: labId, id: runId }).update({ method_record_id: methodRecordId, method: methodName });
}
