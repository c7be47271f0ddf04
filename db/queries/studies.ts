// Study versions.
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbStudyRow } from "@/db/tables";
import { objectWith, readJson } from "@/db/json";
import { studyOptionsSchema } from "@/lib/schemas/studies";
import type { ResolvedMember, StudyResults } from "@/lib/studies";
import { z } from "zod";

/** A study version as read: members, options and results parsed and checked. */
export type StudyRow = Omit<DbStudyRow, "members" | "options" | "results"> & { members: ResolvedMember[]; options: z.infer<typeof studyOptionsSchema>; results: StudyResults };
const storedMembers = z.array(objectWith<ResolvedMember>("fitId", "k", "run_name"));
const storedResults = objectWith<StudyResults>();

function decodeStudy<R extends DbStudyRow>(row: R): Omit<R, "members" | "options" | "results"> & StudyRow {
  const what = `study ${row.id}`;
  return { ...row, members: readJson(storedMembers, row.members, `members of ${what}`), options: readJson(studyOptionsSchema, row.options, `options of ${what}`), results: readJson(storedResults, row.results, `results of ${what}`) };
}

export async function insertStudyVersion(db: Db, row: Omit<DbStudyRow, "id">): Promise<number> {
  const [r] = await db("studies").insert(row).returning("id");
  const id = insertedId(r);
  if (row.record_id === null) await db("studies").where({ id }).update({ record_id: id });
  return id;
}

export async function getStudy(db: Db, labId: number, id: number): Promise<(StudyRow & { author_name: string | null }) | undefined> {
  const row: (DbStudyRow & { author_name: string | null }) | undefined = await db("studies as s").leftJoin("users as u", "u.id", "s.author_id").where({ "s.lab_id": labId, "s.id": id }).first("s.*", "u.display_name as author_name");
  return row && decodeStudy(row);
}

/** Every version of a study record, oldest first (without their JSON columns: callers list them). */
export async function listStudyVersions(db: Db, labId: number, recordId: number): Promise<Array<Pick<DbStudyRow, "id" | "version" | "reason" | "created_at"> & { author_name: string | null }>> {
  return db("studies as s").leftJoin("users as u", "u.id", "s.author_id").where({ "s.lab_id": labId, "s.record_id": recordId }).orderBy("s.version").select("s.id", "s.version", "s.reason", "s.created_at", "u.display_name as author_name");
}

export async function listLatestStudies(db: Db, labId: number) {
  const latest = db("studies").where("lab_id", labId).groupBy("record_id").max({ id: "id" });
  const rows: Array<Pick<DbStudyRow, "id" | "record_id" | "version" | "name" | "kind" | "results" | "members" | "created_at"> & { author_name: string | null }> = await db("studies as s")
    .whereIn("s.id", latest)
    .leftJoin("users as u", "u.id", "s.author_id")
    .orderBy("s.created_at", "desc")
    .select("s.id", "s.record_id", "s.version", "s.name", "s.kind", "s.results", "s.members", "s.created_at", "u.display_name as author_name");
  return rows.map((r) => ({ ...r, members: readJson(z.array(z.unknown()), r.members, `members of study ${r.id}`).length, results: readJson(storedResults, r.results, `results of study ${r.id}`) }));
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
