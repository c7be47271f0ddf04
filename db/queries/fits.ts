// Fit record versions.
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbFitRow } from "@/db/tables";
import { objectWith, readJson } from "@/db/json";
import type { StoredResults } from "@/lib/fits";
import { fitOptionsSchema, type FitOptions } from "@/lib/schemas/fits";

/** A fit version as read: its JSON columns parsed and checked (options by the schema that accepted them). */
export type FitRow = Omit<DbFitRow, "options" | "results"> & { options: FitOptions; results: StoredResults };
const storedResults = objectWith<StoredResults>("quantity", "models", "excluded_indices");

export function decodeFit<R extends DbFitRow>(row: R): Omit<R, "options" | "results"> & FitRow {
  return { ...row, options: readJson(fitOptionsSchema, row.options, `options of fit ${row.id}`), results: readJson(storedResults, row.results, `results of fit ${row.id}`) };
}

export type NewFit = Omit<DbFitRow, "id">;

export async function insertFitVersion(db: Db, row: NewFit): Promise<number> {
  const [r] = await db("fits").insert(row).returning("id");
  const id = insertedId(r);
  if (row.record_id === null) await db("fits").where({ id }).update({ record_id: id });
  return id;
}

export async function getFit(db: Db, labId: number, id: number): Promise<(FitRow & { author_name: string | null; run_name: string; series_name: string }) | undefined> {
  const row: (DbFitRow & { author_name: string | null; run_name: string; series_name: string }) | undefined = await db("fits as f")
    .join("runs as r", "r.id", "f.run_id")
    .join("series as s", "s.id", "f.series_id")
    .leftJoin("users as u", "u.id", "f.author_id")
    .where({ "f.lab_id": labId, "f.id": id })
    .first("f.*", "u.display_name as author_name", "r.name as run_name", "s.name as series_name");
  return row && decodeFit(row);
}

export async function listVersions(db: Db, labId: number, recordId: number): Promise<Array<FitRow & { author_name: string | null }>> {
  const rows: Array<DbFitRow & { author_name: string | null }> = await db("fits as f").leftJoin("users as u", "u.id", "f.author_id").where({ "f.lab_id": labId, "f.record_id": recordId }).orderBy("f.version").select("f.*", "u.display_name as author_name");
  return rows.map(decodeFit);
}

export async function latestVersion(db: Db, labId: number, recordId: number): Promise<FitRow | undefined> {
  const row: DbFitRow | undefined = await db("fits").where({ lab_id: labId, record_id: recordId }).orderBy("version", "desc").first();
  return row && decodeFit(row);
}

export interface FitListFilter {
  labId: number;
  runId?: number;
  q?: string;
  sort: "created_at" | "title" | "k_value" | "version";
  dir: "asc" | "desc";
  limit: number;
  offset: number;
}

/** The newest version of each record. */
export async function listLatestFits(db: Db, f: FitListFilter) {
  const latest = db("fits").where("lab_id", f.labId).groupBy("record_id").max({ id: "id" });
  const lastEvent = db("review_events").where({ lab_id: f.labId, object_type: "fit" }).groupBy("object_id").select("object_id").max({ id: "id" }).as("le");
  const q = db("fits as f")
    .whereIn("f.id", latest)
    .join("runs as r", "r.id", "f.run_id")
    .join("series as s", "s.id", "f.series_id")
    .leftJoin("users as u", "u.id", "f.author_id")
    .leftJoin(lastEvent, "le.object_id", "f.id")
    .leftJoin("review_events as ev", "ev.id", "le.id");
  if (f.runId) q.andWhere("f.run_id", f.runId);
  if (f.q) q.andWhere((w) => w.whereLike("f.title", `%${f.q}%`).orWhereLike("r.name", `%${f.q}%`));
  const total = await q.clone().count<{ n: number | string }[]>({ n: "*" }).first();
  const rows = await q
    .clone()
    .select("f.id", "f.record_id", "f.version", "f.title", "f.primary_model", "f.k_value", "f.k_se", "f.criteria_failed", "f.created_at", "f.run_id", "f.series_id", "r.name as run_name", "s.name as series_name", "u.display_name as author_name", "r.temperature_c", "ev.state as review_state")
    .orderBy(`f.${f.sort}`, f.dir)
    .limit(f.limit)
    .offset(f.offset);
  return { rows, total: Number(total?.n ?? 0) };
}
