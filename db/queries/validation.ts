// Stored validation runs.
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbValidationRunRow } from "@/db/tables";
import { objectWith, readJson } from "@/db/json";
import type { ValidationReport } from "@/lib/validation";

export async function insertValidationRun(db: Db, row: Omit<DbValidationRunRow, "id">): Promise<number> {
  const [r] = await db("validation_runs").insert(row).returning("id");
  return insertedId(r);
}

/** A validation run as read: its report parsed and checked. */
export async function getValidationRun(db: Db, labId: number, id: number): Promise<(Omit<DbValidationRunRow, "report"> & { report: ValidationReport; run_by_name: string }) | undefined> {
  const r: (DbValidationRunRow & { run_by_name: string }) | undefined = await db("validation_runs as v").join("users as u", "u.id", "v.run_by").where({ "v.lab_id": labId, "v.id": id }).first("v.*", "u.display_name as run_by_name");
  return r && { ...r, report: readJson(objectWith<ValidationReport>("engine_version", "cases", "passed", "failed"), r.report, `report of validation run ${r.id}`) };
}

export async function listValidationRuns(db: Db, labId: number) {
  return db("validation_runs as v")
    .join("users as u", "u.id", "v.run_by")
    .where("v.lab_id", labId)
    .orderBy("v.id", "desc")
    .select("v.id", "v.all_passed", "v.passed", "v.failed", "v.engine_version", "v.content_hash", "v.run_at", "u.display_name as run_by_name");
}
