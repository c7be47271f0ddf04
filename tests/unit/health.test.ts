// GET /api/health for a load balancer: 200 when the database is reachable and migrated and mail is configured, 503
// naming what is wrong otherwise (common practice for health endpoints: no secrets, no data in the answer).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { checkHealth } from "@/lib/health";
import { freshDb } from "../helpers/db";

let db: Knex;
beforeAll(async () => {
  db = await freshDb();
  setDb(db);
});
afterAll(() => db.destroy());

describe("health", () => {
  it("reachable, migrated, mail configured: ok, and the route answers 200", async () => {
    expect(await checkHealth(db, { SMTP_URL: "smtp://127.0.0.1:2525" })).toEqual({ ok: true, database: { reachable: true, migrations: "current" }, mail: { configured: true, transport: "smtp" }, raw_store: { kind: "database", reachable: true } });
    const prev = process.env.SMTP_URL;
    process.env.SMTP_URL = "smtp://127.0.0.1:2525";
    try {
      const { GET } = await import("@/app/api/health/route");
      const res = await GET();
      expect(res.status).toBe(200);
      expect(res.headers.get("cache-control")).toBe("no-store");
    } finally {
      if (prev === undefined) delete process.env.SMTP_URL;
      else process.env.SMTP_URL = prev;
    }
  });
  it("no mail server and no explicit choice: not ok", async () => {
    expect(await checkHealth(db, {})).toMatchObject({ ok: false, mail: { configured: false } });
    expect((await checkHealth(db, { MAIL_TRANSPORT: "log" })).ok).toBe(true);
  });
  it("a migration not applied: behind, with the count", async () => {
    const last = (await db("knex_migrations").orderBy("id", "desc").first())!;
    await db("knex_migrations").where({ id: last.id }).delete();
    try {
      expect((await checkHealth(db, { MAIL_TRANSPORT: "log" })).database).toEqual({ reachable: true, migrations: "behind", pending: 1 });
    } finally {
      await db("knex_migrations").insert(last);
    }
  });
  it("an unreachable database: not ok", async () => {
    const gone = (() => {
      throw new Error("connection refused");
    }) as unknown as Knex;
    expect((await checkHealth(gone, { MAIL_TRANSPORT: "log" })).database).toEqual({ reachable: false, migrations: "unknown" });
  });
});
