// Writes audit events: append-only, server clock, each row chained to the previous row's hash (21 CFR 11.10(e)).
import { createHash } from "node:crypto";
import type { Db } from "@/db";
import { auditRowsAfter, insertAuditRow, lastAuditHash, listAuditRows, lockAuditHead, readAuditHead, writeAuditHead, type NewAuditRow } from "@/db/queries/audit";
import { auditMac, headMac } from "./key";
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

type HashedFields = Omit<NewAuditRow, "hash" | "mac">;

export function rowHash(row: HashedFields): string {
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
  // The head row first (locked on PostgreSQL): appends are serialised, so the chain cannot fork.
  const head = await lockAuditHead(db);
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
    prev_hash: head ? head.head_hash : await lastAuditHash(db),
  };
  const hash = rowHash(fields);
  const saved = await insertAuditRow(db, { ...fields, hash, mac: auditMac(hash) });
  const count = (head?.row_count ?? 0) + 1;
  await writeAuditHead(db, { row_count: count, head_id: saved.id, head_hash: hash, mac: headMac(count, saved.id, hash), updated_at: now.toISOString() });
  return saved;
}

/** Appends one event. Inside a caller's transaction it joins it; otherwise it opens its own. */
export async function recordAudit(db: Db, ev: AuditEventInput, now: Date = new Date()): Promise<DbAuditEventRow> {
  if (db.isTransaction) return append(db, ev, now);
  return db.transaction((trx) => append(trx, ev, now));
}

export interface AuditVerification {
  intact: boolean;
  rows: number;
  /** Rows written before the audit key was introduced (hash-chained, without a MAC). */
  unkeyed_rows: number;
  first_broken_row: number | null;
  problems: string[];
}

/**
 * Recomputes the whole trail in pages (bounded memory, whatever its length): each row's hash and link to the one
 * before, each MAC under the audit key, and the head (row count, newest row, its MAC), so an edited row, a re-hashed
 * chain without the key, and deleted newest rows are all reported.
 */
export async function verifyAuditTrail(db: Db, pageSize = 5000): Promise<AuditVerification> {
  const problems: string[] = [];
  let first: number | null = null;
  const broken = (id: number | null, what: string) => {
    if (first === null && id !== null) first = id;
    if (problems.length < 20) problems.push(what);
  };
  let prev: string | null = null;
  let lastId = 0;
  let rows = 0,
    unkeyed = 0,
    keyedSeen = false;
  for (;;) {
    const page = await auditRowsAfter(db, lastId, pageSize);
    for (const row of page) {
      const { id, hash, mac, ...fields } = row;
      rows++;
      if (fields.prev_hash !== prev) broken(id, `Row ${id} does not link to the row before it: a row was removed or inserted.`);
      else if (rowHash(fields) !== hash) broken(id, `Row ${id} has been changed: its content no longer gives its hash.`);
      else if (mac == null) {
        unkeyed++;
        if (keyedSeen) broken(id, `Row ${id} has no MAC after keyed rows: the chain was rewritten without the audit key.`);
      } else {
        keyedSeen = true;
        if (mac !== auditMac(hash)) broken(id, `Row ${id}'s MAC does not match under the audit key: the chain was re-hashed, or the key is not this trail's.`);
      }
      prev = hash;
      lastId = id;
    }
    if (page.length < pageSize) break;
  }
  const head = await readAuditHead(db);
  if (head) {
    if (head.row_count !== rows || (head.head_id ?? null) !== (rows ? lastId : null) || (head.head_hash ?? null) !== prev)
      broken(null, `The trail holds ${rows} rows ending at row ${rows ? lastId : "—"}, but its head records ${head.row_count} rows ending at row ${head.head_id ?? "—"}: rows were deleted or added outside the application.`);
    else if (head.mac !== null && head.mac !== headMac(head.row_count, head.head_id, head.head_hash))
      broken(null, "The trail's head does not match its MAC under the audit key: it was rewritten outside the application.");
  } else if (rows > 0) broken(null, "The trail's head is missing.");
  return { intact: problems.length === 0, rows, unkeyed_rows: unkeyed, first_broken_row: first, problems };
}

/** The id of the first row that does not verify, or null when the whole trail is intact (a shorthand for tests). */
export async function verifyAuditChain(db: Db): Promise<number | null> {
  const v = await verifyAuditTrail(db);
  return v.intact ? null : (v.first_broken_row ?? -1);
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
    oldValues: r.old_values,
    newValues: r.new_values,
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
