// Real concurrent requests against the route handlers on one database: every check that guards a write holds inside
// the transaction that writes. Each request carries its own signed-in user (AsyncLocalStorage), as separate browsers do.
import { AsyncLocalStorage } from "node:async_hooks";
import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { findLabBySlug } from "@/db/queries/labs";
import { insertMembership, insertUser } from "@/db/queries/users";
import { DEMO_LAB, DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { hashPassword } from "@/lib/auth/password";
import { MAX_FAILED_SIGN_INS, signInWithPassword, WRONG_CREDENTIALS, type SignedInUser } from "@/lib/auth/sign-in";
import { saveFit } from "@/lib/fits";
import { ingestExport } from "@/lib/ingest";
import { freshDb } from "../helpers/db";

const als = vi.hoisted(() => ({ store: null as unknown as AsyncLocalStorage<SignedInUser> }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => als.store.getStore() ?? null }));
als.store = new AsyncLocalStorage<SignedInUser>();
const ctx = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) }) as never;

let db: Knex;
const as: Record<string, SignedInUser> = {};
const pw = (role: string) => DEMO_USERS.find((u) => u.role === role)!.password;
const SECOND_REVIEWER = { email: "second.reviewer@larkspur.example", password: "second-reviewer-pass-9" };
let runId: number, seriesId: number;

async function call(user: SignedInUser, path: string, body: unknown, params: Record<string, string> = {}) {
  const mod = await import(`@/app/api/${path}/route`);
  return als.store.run(user, async () => {
    const res = await mod.POST(new Request(`http://halflight.test/api/${path}`, { method: "POST", body: JSON.stringify(body) }), ctx(params));
    return { status: res.status as number, body: await res.json() };
  });
}
const tally = (rs: Array<{ status: number }>) => rs.reduce<Record<number, number>>((m, r) => ({ ...m, [r.status]: (m[r.status] ?? 0) + 1 }), {});
async function newFit(title: string) {
  return (await saveFit(db, as.analyst!, { runId, seriesId, title, options: { models: ["first-order"] } })).id;
}

beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  const lab = (await findLabBySlug(db, DEMO_LAB.slug))!;
  const u = await insertUser(db, { email: SECOND_REVIEWER.email, displayName: "Second Reviewer", passwordHash: await hashPassword(SECOND_REVIEWER.password), createdAt: new Date().toISOString() });
  await insertMembership(db, { userId: u.id, labId: lab.id, role: "reviewer", createdAt: new Date().toISOString() });
  for (const d of DEMO_USERS) as[d.role] = await signInWithPassword(db, d.email, d.password);
  as.reviewer2 = await signInWithPassword(db, SECOND_REVIEWER.email, SECOND_REVIEWER.password);
  const r = await ingestExport(db, { labId: as.analyst!.labId, userId: as.analyst!.userId, bytes: new Uint8Array(fs.readFileSync("fixtures/published/crystal-violet-590nm.csv")), fileName: "cv-concurrency.csv" });
  runId = r.run_id;
  seriesId = r.series[0]!.id;
});
afterAll(() => db.destroy());

describe("review decisions cannot race", () => {
  it("two reviewers approve and reject one submitted version at once: exactly one decision stands, the other gets 409", async () => {
    const id = await newFit("race: decisions");
    expect((await call(as.analyst!, "fits/[id]/submit", { password: pw("analyst") }, { id: String(id) })).status).toBe(200);
    const rs = await Promise.all([
      call(as.reviewer!, "fits/[id]/decision", { decision: "approved", password: pw("reviewer") }, { id: String(id) }),
      call(as.reviewer2!, "fits/[id]/decision", { decision: "rejected", password: SECOND_REVIEWER.password, reason: "curvature in residuals" }, { id: String(id) }),
      call(as.reviewer!, "fits/[id]/decision", { decision: "approved", password: pw("reviewer") }, { id: String(id) }),
      call(as.reviewer2!, "fits/[id]/decision", { decision: "approved", password: SECOND_REVIEWER.password }, { id: String(id) }),
    ]);
    expect(tally(rs)).toEqual({ 200: 1, 409: 3 });
    for (const r of rs.filter((x) => x.status === 409)) expect(r.body.error.message).toMatch(/Someone else acted on this version at the same time|Only a submitted version/);
    const events = await db("review_events").where({ object_type: "fit", object_id: id });
    expect(events.map((e) => e.state).sort()).toEqual([rs.find((r) => r.status === 200)!.body.state, "submitted"].sort());
    expect(await db("signatures").where({ object_type: "fit", object_id: id })).toHaveLength(2);
  });

  it("three submits of one draft at once: one submission, one authored signature, one share link per reviewer", async () => {
    const id = await newFit("race: submits");
    const linksBefore = Number((await db("share_links").count({ n: "*" }))[0]!.n);
    const rs = await Promise.all([0, 1, 2].map(() => call(as.analyst!, "fits/[id]/submit", { password: pw("analyst") }, { id: String(id) })));
    expect(tally(rs)).toEqual({ 200: 1, 409: 2 });
    expect(await db("signatures").where({ object_type: "fit", object_id: id, meaning: "authored" })).toHaveLength(1);
    expect(await db("review_events").where({ object_type: "fit", object_id: id })).toHaveLength(1);
    // Two reviewers in the lab: two links, not six.
    expect(Number((await db("share_links").count({ n: "*" }))[0]!.n) - linksBefore).toBe(2);
  });
});

describe("versions cannot fork", () => {
  it("five new versions saved from version 1 at once: one version 2, four 409s, no duplicate number", async () => {
    const id = await newFit("race: versions");
    const rs = await Promise.all(
      [1, 2, 3, 4, 5].map((i) => call(as.analyst!, "fits", { runId, seriesId, title: "race: versions", previousId: id, reason: `change ${i}`, options: { models: ["first-order"], window: { from: 10 * i } } })),
    );
    expect(tally(rs)).toEqual({ 201: 1, 409: 4 });
    const recordId = (await db("fits").where({ id }).first())!.record_id;
    expect((await db("fits").where({ record_id: recordId })).map((f) => f.version).sort()).toEqual([1, 2]);
    const dup = await db("fits").select("record_id", "version").count({ n: "*" }).groupBy("record_id", "version").having(db.raw("count(*) > 1"));
    expect(dup).toEqual([]);
  });

  it("the database itself refuses a second row with the same record and version", async () => {
    const f = (await db("fits").where({ version: 1 }).first())!;
    const { id: _id, ...copy } = f;
    await expect(db("fits").insert({ ...copy, content_hash: "x".repeat(64) })).rejects.toThrow(/UNIQUE|unique constraint/);
  });
});

describe("the lockout cannot be outrun", () => {
  it("40 wrong passwords in parallel with the right one: not signed in, every attempt counted, the account locked", async () => {
    const u = DEMO_USERS.find((x) => x.role === "method_developer")!;
    const attempts = [...Array.from({ length: 40 }, (_, i) => `wrong-guess-${i}`), u.password];
    const rs = await Promise.allSettled(attempts.map((p) => signInWithPassword(db, u.email, p)));
    expect(rs[40]!.status).toBe("rejected");
    expect(rs.filter((r) => r.status === "fulfilled")).toHaveLength(0);
    const row = (await db("users").where({ email: u.email }).first())!;
    expect(row.failed_sign_ins).toBe(41);
    expect(row.locked_until).not.toBeNull();
    // At most the limit's worth of passwords were compared: the rest were refused as locked without a comparison.
    const failed = await db("audit_events").where({ actor_user_id: row.id, action: "auth.sign_in_failed" });
    expect(failed.length).toBeLessThanOrEqual(MAX_FAILED_SIGN_INS);
    await expect(signInWithPassword(db, u.email, u.password)).rejects.toThrow(WRONG_CREDENTIALS);
  });

  it("wrong signing passwords count toward the same lockout, and are audited", async () => {
    const id = await newFit("signing guesses");
    const guesses = await Promise.all(Array.from({ length: 8 }, (_, i) => call(as.analyst!, "fits/[id]/submit", { password: `sign-guess-${i}` }, { id: String(id) })));
    expect(guesses.every((g) => g.status === 401 || g.status === 423)).toBe(true);
    const row = (await db("users").where({ id: as.analyst!.userId }).first())!;
    expect(row.locked_until).not.toBeNull();
    expect(await db("audit_events").where({ actor_user_id: as.analyst!.userId, action: "signature.refused" })).toHaveLength(8);
    // Now even the right password neither signs nor signs in.
    expect((await call(as.analyst!, "fits/[id]/submit", { password: pw("analyst") }, { id: String(id) })).status).toBe(423);
    await expect(signInWithPassword(db, as.analyst!.email, pw("analyst"))).rejects.toThrow(WRONG_CREDENTIALS);
  });
});
