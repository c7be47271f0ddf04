// Stored validation runs.
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbValidationRunRow } from "@/db/tables";

export async function insertValidationRun(db: Db, row: Omit<DbValidationRunRow, "id">): Promise<number> {
  const [r] = await db("validation_runs").insert(row).returning("id");
  return insertedId(r);
}

export async function getValidationRun(db: Db, labId: number, id: number) {
  return db("validation_runs as v").join("users as u", "u.id", "v.run_by").where({ "v.lab_id": labId, "v.id": id }).first("v.*", "u.display_name as run_by_name");
}

export async function listValidationRuns(db: Db, labId: number) {
  return db("validation_runs as v")
    .join("users as u", "u.id", "v.run_by")
    .where("v.lab_id", labId)
    .orderBy("v.id", "desc")
    .select("v.id", "v.all_passed", "v.passed", "v.failed", "v.engine_version", "v.content_hash", "v.run_at", "u.display_name as run_by_name");
}
