// The data layer: pragmas, reversible migrations, the migration list, and the append-only, hash-chained audit trail.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { openDb } from "@/db";
import { migrateToLatest, rollbackAll } from "@/db/migrate";
import { MIGRATIONS } from "@/db/migrations";
import { insertLab } from "@/db/queries/labs";
import { recordAudit, verifyAuditChain } from "@/lib/audit";
import { freshDb, liftGuards, onPostgres } from "../helpers/db";

let db: Knex | undefined;
afterEach(async () => {
  await db?.destroy();
  db = undefined;
});

async function pragma(k: Knex, name: string): Promise<unknown> {
  const rows = (await k.raw(`PRAGMA ${name}`)) as Array<Record<string, unknown>>;
  return Object.values(rows[0] ?? {})[0];
}

describe.skipIf(onPostgres)("connection pragmas (SQLite)", () => {
  it("turns on WAL, foreign keys, a busy timeout and synchronous NORMAL on a file database", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-db-"));
    db = openDb(path.join(dir, "t.sqlite"));
    expect(await pragma(db, "journal_mode")).toBe("wal");
    expect(await pragma(db, "foreign_keys")).toBe(1);
    expect(await pragma(db, "busy_timeout")).toBe(5000);
    expect(await pragma(db, "synchronous")).toBe(1); // 1 = NORMAL
  });
});

describe("migrations", () => {
  it("lists every file in db/migrations, in order", () => {
    const files = fs
      .readdirSync(path.resolve("db/migrations"))
      .filter((f) => /^\d{14}_.+\.ts$/.test(f))
      .map((f) => f.replace(/\.ts$/, ""))
      .sort();
    expect(MIGRATIONS.map((m) => m.name)).toEqual(files);
  });

  it("go up, all the way down, and up again", async () => {
    db = await freshDb();
    expect(await db.schema.hasTable("audit_events")).toBe(true);
    await rollbackAll(db);
    for (const t of ["labs", "users", "memberships", "audit_events", "raw_files", "runs", "series", "fits", "studies", "signatures", "review_events", "comments", "share_links", "share_views", "validation_runs"]) expect(await db.schema.hasTable(t)).toBe(false);
    await migrateToLatest(db);
    expect(await db.schema.hasTable("memberships")).toBe(true);
  });

  it("enforces foreign keys", async () => {
    db = await freshDb();
    await expect(
      db("memberships").insert({ user_id: 999, lab_id: 999, role: "analyst", created_at: "2026-01-01T00:00:00Z" }),
    ).rejects.toMatchObject({ code: onPostgres ? "23503" : "SQLITE_CONSTRAINT_FOREIGNKEY" });
  });
});

describe("audit trail", () => {
  it("chains each row to the previous one and detects a tampered row", async () => {
    db = await freshDb();
    const lab = await insertLab(db, { slug: "l", name: "L", createdAt: "2026-01-01T00:00:00Z" });
    const first = await recordAudit(db, { labId: lab.id, actorUserId: null, action: "a.one", newValues: { x: 1 } });
    const second = await recordAudit(db, { labId: lab.id, actorUserId: null, action: "a.two", reason: "because" });
    expect(first.prev_hash).toBeNull();
    expect(second.prev_hash).toBe(first.hash);
    expect(await verifyAuditChain(db)).toBeNull();

    // Tampering needs the guard removed first; the chain still shows it.
    await liftGuards(db, "audit_events");
    await db("audit_events").where({ id: first.id }).update({ reason: "edited later" });
    expect(await verifyAuditChain(db)).toBe(first.id);
  });

  it("refuses updates and deletes", async () => {
    db = await freshDb();
    const row = await recordAudit(db, { labId: null, actorUserId: null, action: "a.one" });
    await expect(db("audit_events").where({ id: row.id }).update({ action: "x" })).rejects.toThrow(/append-only/);
    await expect(db("audit_events").where({ id: row.id }).delete()).rejects.toThrow(/append-only/);
    expect((await db("audit_events").count({ n: "*" })).map((r) => ({ n: Number(r.n) }))).toEqual([{ n: 1 }]);
  });
});
