// Background jobs: queued by a request, claimed by exactly one server process (a conditional UPDATE), with progress.
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbJobRow } from "@/db/tables";

export async function insertJob(db: Db, row: Pick<DbJobRow, "lab_id" | "kind" | "created_by" | "created_at">): Promise<number> {
  const [r] = await db("jobs").insert({ ...row, state: "queued", progress_done: 0, progress_total: 0 }).returning("id");
  return insertedId(r);
}

/** Takes a queued job for this process; false when another process (or an earlier delivery) already has it. */
export async function claimJob(db: Db, id: number, at: string): Promise<boolean> {
  return (await db("jobs").where({ id, state: "queued" }).update({ state: "running", started_at: at })) === 1;
}

export async function setJobProgress(db: Db, id: number, done: number, total: number, note: string): Promise<void> {
  await db("jobs").where({ id, state: "running" }).update({ progress_done: done, progress_total: total, progress_note: note.slice(0, 200) });
}

export async function finishJob(db: Db, id: number, at: string, result: unknown): Promise<void> {
  await db("jobs").where({ id, state: "running" }).update({ state: "done", result: JSON.stringify(result), finished_at: at });
}

export async function failJob(db: Db, id: number, at: string, error: string): Promise<void> {
  await db("jobs").where({ id }).whereIn("state", ["queued", "running"]).update({ state: "failed", error: error.slice(0, 2000), finished_at: at });
}

export async function getJob(db: Db, id: number): Promise<DbJobRow | undefined> {
  return db("jobs").where({ id }).first();
}

export async function getLabJob(db: Db, labId: number, id: number): Promise<DbJobRow | undefined> {
  return db("jobs").where({ id, lab_id: labId }).first();
}

/** A running job of this kind in the lab, if any (one validation run at a time per lab). */
export async function activeJobOf(db: Db, labId: number, kind: string): Promise<DbJobRow | undefined> {
  return db("jobs").where({ lab_id: labId, kind }).whereIn("state", ["queued", "running"]).orderBy("id", "desc").first();
}
