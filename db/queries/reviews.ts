// Signatures, review events and comments on record versions.
import { z } from "zod";
import { readJson } from "@/db/json";
import { insertedId } from "./ids";
import type { Db } from "@/db";
import type { DbCommentRow, DbReviewEventRow, DbSignatureRow } from "@/db/tables";

export async function insertSignature(db: Db, row: Omit<DbSignatureRow, "id">): Promise<number> {
  const [r] = await db("signatures").insert(row).returning("id");
  return insertedId(r);
}

export async function insertReviewEvent(db: Db, row: Omit<DbReviewEventRow, "id">): Promise<number> {
  const [r] = await db("review_events").insert(row).returning("id");
  return insertedId(r);
}

export async function insertComment(db: Db, row: Omit<DbCommentRow, "id">): Promise<number> {
  const [r] = await db("comments").insert(row).returning("id");
  return insertedId(r);
}

export async function reviewEventsOf(db: Db, labId: number, objectType: string, objectId: number) {
  return db("review_events as e")
    .join("users as u", "u.id", "e.actor_id")
    .where({ "e.lab_id": labId, "e.object_type": objectType, "e.object_id": objectId })
    .orderBy("e.id")
    .select("e.*", "u.display_name as actor_name");
}

export async function signaturesOf(db: Db, labId: number, objectType: string, objectId: number): Promise<DbSignatureRow[]> {
  return db("signatures").where({ lab_id: labId, object_type: objectType, object_id: objectId }).orderBy("id");
}

export async function commentsOf(db: Db, labId: number, objectType: string, objectIds: number[]) {
  return db("comments as c")
    .join("users as u", "u.id", "c.author_id")
    .where({ "c.lab_id": labId, "c.object_type": objectType })
    .whereIn("c.object_id", objectIds)
    .orderBy("c.id")
    .select("c.*", "u.display_name as author_name");
}

/** Fit versions whose latest review event is "submitted", oldest first. */
export async function submittedFits(db: Db, labId: number) {
  const latest = db("review_events").where({ lab_id: labId, object_type: "fit" }).groupBy("object_id").max({ id: "id" });
  return db("review_events as e")
    .whereIn("e.id", latest)
    .andWhere("e.state", "submitted")
    .join("fits as f", "f.id", "e.object_id")
    .join("users as u", "u.id", "e.actor_id")
    .join("runs as r", "r.id", "f.run_id")
    .orderBy("e.at", "asc")
    .select("f.id", "f.title", "f.version", "f.k_value", "f.k_se", "f.author_id", "r.name as run_name", "e.at as submitted_at", "u.display_name as submitted_by");
}

/** Study versions whose latest review event is "submitted", oldest first, in the queue's shape. */
export async function submittedStudies(db: Db, labId: number) {
  const latest = db("review_events").where({ lab_id: labId, object_type: "study" }).groupBy("object_id").max({ id: "id" });
  const rows: Array<{ id: number; title: string; version: number; author_id: number | null; members: string; submitted_at: string; submitted_by: string }> = await db("review_events as e")
    .whereIn("e.id", latest)
    .andWhere("e.state", "submitted")
    .join("studies as s", "s.id", "e.object_id")
    .join("users as u", "u.id", "e.actor_id")
    .orderBy("e.at", "asc")
    .select("s.id", "s.name as title", "s.version", "s.author_id", "s.members", "e.at as submitted_at", "u.display_name as submitted_by");
  return rows.map(({ members, ...r }) => ({ ...r, k_value: null, k_se: null, run_name: `${readJson(z.array(z.unknown()), members, `members of study ${r.id}`).length} fits` }));
}

/**
 * Moves a record version's review state from one of `from` to `to` in one conditional statement (compare-and-set):
 * true when this call made the move, false when the state was not one of `from` (another decision came first).
 * "draft" has no row: the first move inserts one, and the primary key refuses a second, concurrent first move.
 */
export async function moveReviewState(db: Db, labId: number, objectType: string, objectId: number, from: readonly string[], to: string): Promise<boolean> {
  const changed = await db("review_heads")
    .where({ object_type: objectType, object_id: objectId, lab_id: labId })
    .whereIn("state", from as string[])
    .update({ state: to, seq: db.raw("seq + 1") });
  if (changed === 1) return true;
  if (!from.includes("draft")) return false;
  const inserted = await db.raw(
    `INSERT INTO review_heads (object_type, object_id, lab_id, state, seq) SELECT ?, ?, ?, ?, 1
     WHERE NOT EXISTS (SELECT 1 FROM review_heads WHERE object_type = ? AND object_id = ?)`,
    [objectType, objectId, labId, to, objectType, objectId],
  );
  return rowsAffected(inserted) === 1;
}

/** Rows changed by a raw INSERT/UPDATE, for better-sqlite3 (changes) and pg (rowCount). */
function rowsAffected(result: unknown): number {
  const r = result as { changes?: number; rowCount?: number };
  return Number(r.changes ?? r.rowCount ?? 0);
}

/** A comment of this lab on this record version (a reply's parent must be one). */
export async function findCommentOn(db: Db, labId: number, objectType: string, objectId: number, id: number): Promise<DbCommentRow | undefined> {
  return db("comments").where({ id, lab_id: labId, object_type: objectType, object_id: objectId }).first();
}
