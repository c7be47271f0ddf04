// The audit trail: rows are only ever inserted (the database refuses updates and deletes).
import type { Db } from "@/db";
import { anyJson, readJson } from "@/db/json";
import type { DbAuditEventRow, DbAuditHeadRow } from "@/db/tables";

export type NewAuditRow = Omit<DbAuditEventRow, "id">;

export async function lastAuditHash(db: Db): Promise<string | null> {
  const row = await db("audit_events").orderBy("id", "desc").first("hash");
  return row?.hash ?? null;
}

export async function insertAuditRow(db: Db, row: NewAuditRow): Promise<DbAuditEventRow> {
  const [saved] = await db("audit_events").insert(row).returning("*");
  return saved as DbAuditEventRow;
}

/** An audit row as listed: its old and new values parsed (any JSON; the chain's hash covers their text). */
export type AuditRowWithActor = Omit<DbAuditEventRow, "old_values" | "new_values"> & { actor_name: string | null; old_values: unknown; new_values: unknown };
const values = (text: string | null, id: number, which: string) => (text ? readJson(anyJson, text, `${which} of audit event ${id}`) : null);

export async function listAuditRows(
  db: Db,
  opts: { labId: number; limit: number; beforeId?: number; action?: string; from?: string; to?: string; objectType?: string; objectId?: string },
): Promise<AuditRowWithActor[]> {
  const q = db("audit_events as a")
    .leftJoin("users as u", "u.id", "a.actor_user_id")
    .where("a.lab_id", opts.labId)
    .orderBy("a.id", "desc")
    .limit(opts.limit)
    .select("a.*", "u.display_name as actor_name");
  if (opts.beforeId) q.andWhere("a.id", "<", opts.beforeId);
  if (opts.action) q.andWhereLike("a.action", `${opts.action}%`);
  if (opts.from) q.andWhere("a.at", ">=", opts.from);
  if (opts.to) q.andWhere("a.at", "<=", opts.to);
  if (opts.objectType) q.andWhere("a.object_type", opts.objectType);
  if (opts.objectId) q.andWhere("a.object_id", opts.objectId);
  const rows: Array<DbAuditEventRow & { actor_name: string | null }> = await q;
  return rows.map((r) => ({ ...r, old_values: values(r.old_values, r.id, "old values"), new_values: values(r.new_values, r.id, "new values") }));
}

/** Every event of one object, oldest first (a record's report prints them all). */
export async function auditRowsOfObject(db: Db, labId: number, objectType: string, objectId: string): Promise<AuditRowWithActor[]> {
  const rows: Array<DbAuditEventRow & { actor_name: string | null }> = await db("audit_events as a")
    .leftJoin("users as u", "u.id", "a.actor_user_id")
    .where({ "a.lab_id": labId, "a.object_type": objectType, "a.object_id": objectId })
    .orderBy("a.id")
    .select("a.*", "u.display_name as actor_name");
  return rows.map((r) => ({ ...r, old_values: values(r.old_values, r.id, "old values"), new_values: values(r.new_values, r.id, "new values") }));
}

/** One page of rows after `afterId`, oldest first: verification streams the trail in bounded memory. */
export async function auditRowsAfter(db: Db, afterId: number, limit: number): Promise<DbAuditEventRow[]> {
  return db("audit_events").where("id", ">", afterId).orderBy("id", "asc").limit(limit);
}

/** The trail's head, read with a row lock where the database has them, so appends are serialised. */
export async function lockAuditHead(db: Db): Promise<DbAuditHeadRow | undefined> {
  const q = db("audit_head").where({ id: 1 });
  return (String(db.client.config.client).includes("pg") ? q.forUpdate() : q).first();
}

export async function readAuditHead(db: Db): Promise<DbAuditHeadRow | undefined> {
  return db("audit_head").where({ id: 1 }).first();
}

export async function writeAuditHead(db: Db, head: Omit<DbAuditHeadRow, "id">): Promise<void> {
  const n = await db("audit_head").where({ id: 1 }).update(head);
  if (n === 0) await db("audit_head").insert({ id: 1, ...head });
}
