// Rate limits by client address and by account, counted in the database: a 429 with Retry-After past each limit, a
// flood audited once per window, and the counts shared by two server processes on one database file. The limits are
// the product's (lib/http/rate-limit.ts; throttling beside lockout is OWASP Authentication Cheat Sheet advice, common
// practice); the counting is rate-limiter-flexible's.
import { spawn } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { createApiKey } from "@/lib/admin/api-keys";
import { signInWithPassword, type SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { RATE_RULES } from "@/lib/http/rate-limit";
import { saveFit } from "@/lib/fits";
import { ingestExport } from "@/lib/ingest";
import { createShareLink } from "@/lib/sharing";
import { emptyTarget, freshDb, onPostgres, signInAs } from "../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));
const APP = "http://halflight.test";

let db: Knex;
let analyst: SignedInUser;
beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  analyst = await signInAs(db, "analyst");
});
beforeEach(async () => {
  session.current = analyst;
  await db("rate_limits").delete();
});
afterAll(() => db.destroy());

const floods = async () => (await db("audit_events").where({ action: "security.rate_limited" }).count({ n: "*" }))[0]!.n;
const refusal = (p: Promise<unknown>) => p.then(() => null, (e: AppError) => e);

describe("sign-in", () => {
  it(`past ${RATE_RULES.signInByAddress.points} attempts from one address, over many e-mails, the next is 429 and the flood is audited once`, async () => {
    const before = Number(await floods());
    for (let i = 0; i < RATE_RULES.signInByAddress.points; i++) {
      const e = await refusal(signInWithPassword(db, `nobody-${i}@example.org`, "x", new Date(), { address: "203.0.113.7" }));
      expect(e?.code).toBe("unauthorized");
    }
    for (let i = 0; i < 3; i++) {
      const e = await refusal(signInWithPassword(db, `more-${i}@example.org`, "x", new Date(), { address: "203.0.113.7" }));
      expect(e?.code).toBe("too_many_requests");
      expect(e?.status).toBe(429);
      expect(e?.retryAfter).toBeGreaterThan(0);
      expect(e?.message).toMatch(/Too many sign-in attempts from this address: at most 30 in 15 minutes/);
    }
    expect(Number(await floods())).toBe(before + 1);
    // Another address is not held back by this one.
    const other = await signInWithPassword(db, DEMO_USERS[0]!.email, DEMO_USERS[0]!.password, new Date(), { address: "198.51.100.4" });
    expect(other.email).toBe(DEMO_USERS[0]!.email);
  });
  it(`past ${RATE_RULES.signInByAccount.points} attempts for one e-mail from many addresses, the next is 429`, async () => {
    const email = "target@example.org";
    for (let i = 0; i < RATE_RULES.signInByAccount.points; i++) await refusal(signInWithPassword(db, email, "x", new Date(), { address: `192.0.2.${i}` }));
    const e = await refusal(signInWithPassword(db, email, "x", new Date(), { address: "192.0.2.250" }));
    expect(e?.status).toBe(429);
    expect(e?.message).toMatch(/sign-in attempts for this e-mail/);
  });
});

describe("share links, API keys and invitations over HTTP", () => {
  it("share-link opens from one address: 429 with Retry-After past the limit", async () => {
    const run = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: new Uint8Array(fs.readFileSync("fixtures/published/crystal-violet-590nm.csv")), fileName: "cv.csv" });
    const fitId = (await saveFit(db, analyst, { runId: run.run_id, seriesId: run.series[0]!.id, title: "rate", options: { models: ["first-order"] } })).id;
    const link = await createShareLink(db, analyst, fitId, {});
    const { GET } = await import("@/app/api/share/[token]/route");
    const open = () => GET(new Request(`${APP}/api/share/x`, { headers: { "x-forwarded-for": "203.0.113.9" } }), { params: Promise.resolve({ token: link.path.split("/").pop()! }) } as never);
    for (let i = 0; i < RATE_RULES.shareByAddress.points; i++) expect((await open()).status).toBe(200);
    const over = await open();
    expect(over.status).toBe(429);
    expect(Number(over.headers.get("retry-after"))).toBeGreaterThan(0);
  });
  it("refused API keys from one address: past the limit even a good key from that address waits; another address does not", async () => {
    const admin = await signInAs(db, "admin");
    const good = await createApiKey(db, admin, "Bench reader");
    const { POST } = await import("@/app/api/ingest/route");
    const post = (key: string, address: string) => {
      const form = new FormData();
      form.set("file", new File([fs.readFileSync("parsers/delimited/fixtures/cv-iso.csv")], "cv-iso.csv"));
      return POST(new Request(`${APP}/api/ingest`, { method: "POST", body: form, headers: { authorization: `Bearer ${key}`, "x-forwarded-for": `10.0.0.1, ${address}` } }));
    };
    for (let i = 0; i < RATE_RULES.apiKeyFailuresByAddress.points; i++) expect((await post(`hl_guess${i}`, "203.0.113.50")).status).toBe(401);
    expect((await post("hl_guess-more", "203.0.113.50")).status).toBe(429);
    const held = await post(good.key, "203.0.113.50");
    expect(held.status).toBe(429);
    expect((await held.json()).error.message).toMatch(/refused API keys from this address/);
    expect([200, 201]).toContain((await post(good.key, "198.51.100.50")).status);
  });
  it("invitation tokens from one address: 429 past the limit, before the token is looked up", async () => {
    const { POST } = await import("@/app/api/invitations/[token]/route");
    const accept = () =>
      POST(new Request(`${APP}/api/invitations/x`, { method: "POST", headers: { origin: APP, "content-type": "application/json", "x-forwarded-for": "203.0.113.77" }, body: JSON.stringify({ password: "a long enough password" }) }), {
        params: Promise.resolve({ token: "not-a-real-token-aaaaaaaaaaaa" }),
      });
    for (let i = 0; i < RATE_RULES.invitationByAddress.points; i++) expect((await accept()).status).not.toBe(429);
    expect((await accept()).status).toBe(429);
  });
});

describe("shared by server processes", () => {
  it(`two processes on one ${onPostgres ? "PostgreSQL database" : "database file"} count into the same limit`, async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-rl-"));
    const target = await emptyTarget(path.join(dir, "lab.sqlite"));
    const setup = target.open();
    await migrateToLatest(setup);
    await setup.destroy();
    const script = `
      import knex from "knex";
      import { openDb } from "@/db";
      import { postgresConfig } from "@/db/config";
      import { takeOrRefuse } from "@/lib/http/rate-limit";
      (async () => {
        const db = process.env.DATABASE_URL ? knex(postgresConfig(process.env.DATABASE_URL)) : openDb(process.env.DATABASE_FILE!);
        let ok = 0, refused = 0, keyOk = 0;
        for (let i = 0; i < 25; i++) { try { await takeOrRefuse(db, "signInByAddress", "address 203.0.113.200"); ok++; } catch { refused++; } }
        for (let i = 0; i < 8; i++) { try { await takeOrRefuse(db, "apiKeyFailuresByAddress", "address 203.0.113.200"); keyOk++; } catch { /* refused */ } }
        console.log(JSON.stringify({ ok, refused, keyOk }));
        await db.destroy();
      })();`;
    const scriptFile = path.join(process.cwd(), `tests/unit/.rl-process-${process.pid}.ts`);
    fs.writeFileSync(scriptFile, script);
    try {
      const run = () =>
        new Promise<{ ok: number; refused: number; keyOk: number }>((resolve, reject) => {
          const p = spawn(process.execPath, [path.resolve("node_modules/tsx/dist/cli.mjs"), scriptFile], { env: { ...process.env, ...target.env } });
          let out = "";
          let err = "";
          p.stdout.on("data", (d) => (out += d));
          p.stderr.on("data", (d) => (err += d));
          p.on("exit", (code) => (code === 0 ? resolve(JSON.parse(out.trim().split("\n").pop()!)) : reject(new Error(err))));
        });
      const [a, b] = await Promise.all([run(), run()]);
      // 50 attempts in all against one limit of 30: exactly 30 let through, however the two processes interleaved.
      expect(a.ok + b.ok).toBe(RATE_RULES.signInByAddress.points);
      expect(a.refused + b.refused).toBe(50 - RATE_RULES.signInByAddress.points);
      // The refused-API-key limit too: 16 attempts against a limit of 10.
      expect(a.keyOk + b.keyOk).toBe(RATE_RULES.apiKeyFailuresByAddress.points);
    } finally {
      fs.rmSync(scriptFile, { force: true });
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe("a site's own counts", () => {
  it("RATE_LIMITS changes a count by name and refuses an unknown name", async () => {
    const { applyRateOverrides } = await import("@/lib/http/rate-limit");
    const before = RATE_RULES.shareByAddress.points;
    applyRateOverrides("shareByAddress=120");
    expect(RATE_RULES.shareByAddress.points).toBe(120);
    applyRateOverrides(`shareByAddress=${before}`);
    expect(() => applyRateOverrides("signInByAdress=5")).toThrow(/not a known limit/);
    expect(() => applyRateOverrides("signInByAddress=0")).toThrow(/whole count/);
  });
});
