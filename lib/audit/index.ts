// Writes audit events: append-only, server clock, each row chained to the previous row's hash (21 CFR 11.10(e)).
import { createHash } from "node:crypto";
import type { Db } from "@/db";
import { allAuditRowsInOrder, insertAuditRow, lastAuditHash, listAuditRows, type NewAuditRow } from "@/db/queries/audit";
import type { DbAuditEventRow } from "@/db/tables";

export interface AuditEventInput {
  labId: number | null;
  actorUserId: number | null;
  actorLabel?: string | null;
  action: string;
  objectType?: string | null;
  objectId?: string | number | null;
  objectVersion?: number | null;
  oldValues?: unknown;
  newValues?: unknown;
  reason?: string | null;
}

type HashedFields = Omit<NewAuditRow, "hash">;

function rowHash(row: HashedFields): string {
  // Fixed field order, so the hash does not depend on how a driver returns columns.
  const canonical = JSON.stringify([
    row.prev_hash,
    row.lab_id,
    row.actor_user_id,
    row.actor_label,
    row.at,
    row.action,
    row.object_type,
    row.object_id,
    row.object_version,
    row.old_values,
    row.new_values,
    row.reason,
  ]);
  return createHash("sha256").update(canonical).digest("hex");
}

async function append(db: Db, ev: AuditEventInput, now: Date): Promise<DbAuditEventRow> {
  const fields: HashedFields = {
    lab_id: ev.labId,
    actor_user_id: ev.actorUserId,
    actor_label: ev.actorLabel ?? null,
    at: now.toISOString(),
    action: ev.action,
    object_type: ev.objectType ?? null,
    object_id: ev.objectId == null ? null : String(ev.objectId),
    object_version: ev.objectVersion ?? null,
    old_values: ev.oldValues === undefined ? null : JSON.stringify(ev.oldValues),
    new_values: ev.newValues === undefined ? null : JSON.stringify(ev.newValues),
    reason: ev.reason ?? null,
    prev_hash: await lastAuditHash(db),
  };
  return insertAuditRow(db, { ...fields, hash: rowHash(fields) });
}

/** Appends one event. Inside a caller's transaction it joins it; otherwise it opens its own. */
export async function recordAudit(db: Db, ev: AuditEventInput, now: Date = new Date()): Promise<DbAuditEventRow> {
  if (db.isTransaction) return append(db, ev, now);
  return db.transaction((trx) => append(trx, ev, now));
}

/** Recomputes the chain; returns the id of the first row that does not match, or null when the trail is intact. */
export async function verifyAuditChain(db: Db): Promise<number | null> {
  let prev: string | null = null;
  for (const row of await allAuditRowsInOrder(db)) {
    const { id, hash, ...fields } = row;
    if (fields.prev_hash !== prev || rowHash(fields) !== hash) return id;
    prev = hash;
  }
  return null;
}

/** The lab's trail, newest first, a page at a time. */
export async function listAuditTrail(
  db: Db,
  labId: number,
  q: { limit: number; before?: number; action?: string; from?: string; to?: string; objectType?: string; objectId?: string },
): Promise<import("@/lib/schemas/audit").AuditEvent[]> {
  const rows = await listAuditRows(db, { labId, limit: q.limit, beforeId: q.before, action: q.action, from: q.from, to: q.to, objectType: q.objectType, objectId: q.objectId });
  return rows.map((r) => ({
    id: r.id,
    at: r.at,
    actorUserId: r.actor_user_id,
    actorLabel: r.actor_name ?? r.actor_label,
    action: r.action,
    objectType: r.object_type,
    objectId: r.object_id,
    objectVersion: r.object_version,
    oldValues: r.old_values ? JSON.parse(r.old_values) : null,
    newValues: r.new_values ? JSON.parse(r.new_values) : null,
    reason: r.reason,
    hash: r.hash,
  }));
}

/** The trail as CSV (text cells escaped against spreadsheet formulas). */
export function auditCsv(events: import("@/lib/schemas/audit").AuditEvent[], cell: (v: unknown) => string): string {
  const head = "id,at_utc,who,action,object_type,object_id,object_version,reason,old_values,new_values,hash";
  const rows = events.map((e) =>
    [e.id, e.at, e.actorLabel ?? e.actorUserId, e.action, e.objectType, e.objectId, e.objectVersion, e.reason, e.oldValues == null ? "" : JSON.stringify(e.oldValues), e.newValues == null ? "" : JSON.stringify(e.newValues), e.hash].map(cell).join(","),
  );
  return [head, ...rows].join("\n") + "\n";
}
