// Tampering on a copy of the database, the way someone with file access would do it: the guards refuse ordinary
// updates; where the guards are removed first, the verification recomputes hashes and reports each change.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { openDb, setDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import { recordAudit, verifyAuditTrail } from "@/lib/audit";
import { auditMac } from "@/lib/audit/key";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { saveFit } from "@/lib/fits";
import { ingestExport } from "@/lib/ingest";
import { checkLabIntegrity, verifyFitVersion } from "@/lib/integrity";
import { rawFileDownload } from "@/lib/runs";
import { freshDb, liftGuards, onPostgres, signInAs } from "../helpers/db";

let db: Knex;
let analyst: SignedInUser, admin: SignedInUser;
let fitId: number, runId: number, rawFileId: number;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-tamper-"));

beforeAll(async () => {
  // A database file, as a lab's copy would be (or a database of its own on the PostgreSQL test cluster).
  if (onPostgres) db = await freshDb();
  else {
    db = openDb(path.join(dir, "copy.sqlite"));
    await migrateToLatest(db);
  }
  setDb(db);
  await seedDemoWhenEmpty(db, new Date(), { runs: true });
  analyst = await signInAs(db, "analyst");
  admin = await signInAs(db, "admin");
  const r = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: new Uint8Array(fs.readFileSync("fixtures/published/crystal-violet-590nm.csv")), fileName: "cv-tamper.csv" });
  runId = r.run_id;
  rawFileId = (await db("runs").where({ id: runId }).first())!.raw_file_id;
  fitId = (await saveFit(db, analyst, { runId, seriesId: r.series[0]!.id, title: "tamper target", options: { models: ["first-order"] } })).id;
});
afterAll(() => db.destroy());

describe("the database refuses changes", () => {
  it("an UPDATE or DELETE of series or runs is refused (a run's method may still be reassigned)", async () => {
    await expect(db("series").where({ run_id: runId }).update({ name: "edited" })).rejects.toThrow(/series are immutable/);
    await expect(db("series").where({ run_id: runId }).delete()).rejects.toThrow(/series are immutable/);
    await expect(db("runs").where({ id: runId }).update({ temperature_c: 99 })).rejects.toThrow(/runs are immutable/);
    await expect(db("runs").where({ id: runId }).delete()).rejects.toThrow(/runs are immutable/);
    await expect(db("runs").where({ id: runId }).update({ method: "reassigned" })).resolves.toBe(1);
  });
});

describe("verification recomputes what is stored", () => {
  it("the demo lab and a fresh record verify clean: every fit, study and method, and the audit trail", async () => {
    const r = await checkLabIntegrity(db, admin);
    expect(r.records.failed).toEqual([]);
    expect(r.records.checked).toBeGreaterThan(5);
    expect(r.audit.intact).toBe(true);
    expect(r.intact).toBe(true);
    expect(await db("audit_events").where({ action: "integrity.checked" })).toHaveLength(1);
  });

  it("results edited with the content hash kept are reported", async () => {
    await liftGuards(db, "fits");
    const f = (await db("fits").where({ id: fitId }).first())!;
    const results = JSON.parse(f.results);
    results.models[0].result.parameters.find((p: { name: string }) => p.name === "k").value *= 1.1;
    await db.raw("UPDATE fits SET results = ? WHERE id = ?", [JSON.stringify(results), fitId]);
    const v = await verifyFitVersion(db, analyst.labId, fitId);
    expect(v.ok).toBe(false);
    expect(v.problems.join(" ")).toMatch(/no longer give the version's content hash/);
  });

  it("points behind a record changed under the trigger are reported", async () => {
    await liftGuards(db, "series");
    const s = (await db("series").where({ run_id: runId }).first())!;
    const y = Buffer.from(s.y_f64);
    y.writeDoubleLE(y.readDoubleLE(0) + 0.01, 0);
    await db.raw("UPDATE series SET y_f64 = ? WHERE id = ?", [y, s.id]);
    expect((await verifyFitVersion(db, analyst.labId, fitId)).problems.join(" ")).toMatch(/stored points behind this fit have changed/);
  });

  it("raw bytes replaced: reported, and the download refuses them", async () => {
    await liftGuards(db, "raw_files");
    await db.raw("UPDATE raw_files SET bytes = ? WHERE id = ?", [Buffer.from("t,A\n0,1\n"), rawFileId]);
    expect((await verifyFitVersion(db, analyst.labId, fitId)).problems.join(" ")).toMatch(/no longer matches its SHA-256/);
    await expect(rawFileDownload(db, analyst.labId, rawFileId)).rejects.toThrow(/no longer matches its SHA-256/);
  });

  it("the newest audit rows deleted: reported by the head", async () => {
    await recordAudit(db, { labId: null, actorUserId: null, action: "probe.one" });
    await recordAudit(db, { labId: null, actorUserId: null, action: "probe.two" });
    expect((await verifyAuditTrail(db)).intact).toBe(true);
    await liftGuards(db, "audit_events");
    const newest = (await db("audit_events").orderBy("id", "desc").limit(2).select("id")).map((r) => r.id);
    await db("audit_events").whereIn("id", newest).delete();
    const v = await verifyAuditTrail(db);
    expect(v.intact).toBe(false);
    expect(v.problems.join(" ")).toMatch(/rows were deleted or added outside the application/);
  });

  it("the whole chain re-hashed without the key: reported by the MACs", async () => {
    // Put the head back in line with the rows first, as someone covering the deletion would.
    const last = (await db("audit_events").orderBy("id", "desc").first())!;
    const count = Number((await db("audit_events").count({ n: "*" }))[0]!.n);
    await db("audit_head").where({ id: 1 }).update({ row_count: count, head_id: last.id, head_hash: last.hash });
    expect((await verifyAuditTrail(db)).problems.join(" ")).toMatch(/head does not match its MAC/);
    // Now rewrite an old row and re-hash every row after it with SHA-256, as the unkeyed chain allowed.
    await liftGuards(db, "audit_events");
    const { createHash } = await import("node:crypto");
    const rows = await db("audit_events").orderBy("id");
    let prev: string | null = null;
    for (const [i, r] of rows.entries()) {
      const reason = i === 3 ? "rewritten later" : r.reason;
      const canonical: string = JSON.stringify([prev, r.lab_id, r.actor_user_id, r.actor_label, r.at, r.action, r.object_type, r.object_id, r.object_version, r.old_values, r.new_values, reason]);
      const hash: string = createHash("sha256").update(canonical).digest("hex");
      await db("audit_events").where({ id: r.id }).update({ reason, prev_hash: prev, hash });
      prev = hash;
    }
    const v = await verifyAuditTrail(db);
    expect(v.intact).toBe(false);
    expect(v.problems.join(" ")).toMatch(/MAC does not match under the audit key/);
    // With the key the MACs would match: the check really is the key.
    expect(auditMac(rows[0]!.hash)).toBe(rows[0]!.mac);
  });
});
