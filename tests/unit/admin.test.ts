// Lab administration beyond members: invitations by e-mail (through the local SMTP sink), password rules, lab
// settings, and instrument API keys with POST /api/ingest (Bearer): revoked keys, lab scoping, bad files, rate limit.
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { insertLab } from "@/db/queries/labs";
import { insertMembership, insertUser } from "@/db/queries/users";
import { countIngestRows } from "@/db/queries/runs";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { createApiKey, revokeApiKey } from "@/lib/admin/api-keys";
import { RATE_RULES } from "@/lib/http/rate-limit";
import { acceptInvitation, inviteUser, listInvitations, revokeInvitation } from "@/lib/admin/invitations";
import { changeLabSettings, getLabSettings, passwordProblems } from "@/lib/admin/settings";
import { hashPassword } from "@/lib/auth/password";
import { signInWithPassword, type SignedInUser } from "@/lib/auth/sign-in";
import { ingestExport } from "@/lib/ingest";
import { freshDb, signInAs } from "./../helpers/db";
import { testMailSink } from "./../helpers/mail";

let db: Knex;
let admin: SignedInUser;
let otherAdmin: SignedInUser;
let sink: Awaited<ReturnType<typeof testMailSink>>;
const mails = async () =>
  Promise.all(
    fs.readdirSync(sink.dir).filter((f) => f.endsWith(".eml")).sort().map(async (f) => {
      const m = await simpleParser(fs.readFileSync(path.join(sink.dir, f)));
      return { to: Array.isArray(m.to) ? m.to.map((x) => x.text).join(", ") : (m.to?.text ?? ""), subject: m.subject ?? "", text: m.text ?? "" };
    }),
  );

beforeAll(async () => {
  sink = await testMailSink("invite");
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  admin = await signInAs(db, "admin");
  // A second lab with its own administrator, for the scoping checks.
  const lab = await insertLab(db, { slug: "fennwick", name: "Fennwick Water Lab", createdAt: new Date().toISOString() });
  const u = await insertUser(db, { email: "oda.brenn@fennwick.example", displayName: "Oda Brenn", passwordHash: await hashPassword("fennwick-admin-pass"), createdAt: new Date().toISOString() });
  await insertMembership(db, { userId: u.id, labId: lab.id, role: "admin", createdAt: new Date().toISOString() });
  otherAdmin = await signInWithPassword(db, "oda.brenn@fennwick.example", "fennwick-admin-pass");
});
afterAll(async () => {
  await sink.stop();
  await db.destroy();
});

describe("password rules (common practice: a minimum length, never the account's own e-mail)", () => {
  it("names each problem", () => {
    expect(passwordProblems("short", "a.b@x.example", 12)).toEqual([expect.stringMatching(/at least 12 characters \(this one has 5\)/)]);
    expect(passwordProblems("my-nell.hart-password", "nell.hart@x.example", 12)).toEqual([expect.stringMatching(/e-mail address/)]);
    expect(passwordProblems("aaaaaaaaaaaaaa", "q@x.example", 12)).toEqual([expect.stringMatching(/repeat one character/)]);
    expect(passwordProblems("violet-ledger-51-harbour", "nell.hart@x.example", 12)).toEqual([]);
  });
});

describe("invitations", () => {
  it("mails a one-time link; the invitee sets a password under the lab's rules and signs in with the role given", async () => {
    const inv = await inviteUser(db, admin, { email: "nell.hart@larkspur.example", name: "Nell Hart", role: "reviewer", days: 7 });
    expect(inv.mailed).toBe(true);
    const m = (await mails()).at(-1)!;
    expect(m.to).toContain("nell.hart@larkspur.example");
    expect(m.subject).toMatch(/invited to Larkspur Stability Services/);
    const token = m.text.match(/\/invite\/([A-Za-z0-9_-]+)/)![1]!;
    expect(m.text).toContain(`http://halflight.test/invite/${token}`);
    await expect(acceptInvitation(db, token, "short")).rejects.toThrow(/at least 12 characters/);
    await expect(acceptInvitation(db, token, "nell.hart-is-me-2026")).rejects.toThrow(/e-mail address/);
    await acceptInvitation(db, token, "violet-ledger-51-harbour");
    const me = await signInWithPassword(db, "nell.hart@larkspur.example", "violet-ledger-51-harbour");
    expect(me).toMatchObject({ role: "reviewer", labId: admin.labId });
    await expect(acceptInvitation(db, token, "violet-ledger-51-harbour")).rejects.toMatchObject({ code: "gone" });
    expect(await db("invitations").where({ email: "nell.hart@larkspur.example" }).first()).not.toHaveProperty("token", token);
    const ev = await db("audit_events").whereIn("action", ["invitation.created", "invitation.accepted"]).select("action");
    expect(ev.map((e) => e.action)).toEqual(["invitation.created", "invitation.accepted"]);
  });

  it("an expired or withdrawn invitation no longer opens; an existing account cannot be invited", async () => {
    const old = await inviteUser(db, admin, { email: "late.comer@larkspur.example", name: "Late Comer", role: "analyst", days: 1 }, new Date(Date.now() - 2 * 86_400_000));
    await expect(acceptInvitation(db, old.path.split("/").at(-1)!, "violet-ledger-51-harbour")).rejects.toThrow(/expired/);
    const w = await inviteUser(db, admin, { email: "not.now@larkspur.example", name: "Not Now", role: "analyst", days: 7 });
    await revokeInvitation(db, admin, w.id);
    await expect(acceptInvitation(db, w.path.split("/").at(-1)!, "violet-ledger-51-harbour")).rejects.toThrow(/withdrawn/);
    expect((await listInvitations(db, admin.labId)).map((i) => i.state)).toEqual(expect.arrayContaining(["accepted", "expired", "revoked"]));
    await expect(inviteUser(db, admin, { email: DEMO_USERS[0]!.email, name: "Again", role: "analyst", days: 7 })).rejects.toMatchObject({ code: "conflict" });
    expect(await db("users").where({ email: "late.comer@larkspur.example" }).first()).toBeUndefined();
  });

  it("follows the lab's minimum length when the administrator raises it", async () => {
    await changeLabSettings(db, admin, { outside_links: false, default_link_days: 10, upload_limit_mb: 50, password_min_length: 20, reason: "policy update" });
    expect(await getLabSettings(db, admin.labId)).toMatchObject({ password_min_length: 20, default_link_days: 10 });
    const inv = await inviteUser(db, admin, { email: "ines.kolt@larkspur.example", name: "Ines Kolt", role: "analyst", days: 7 });
    await expect(acceptInvitation(db, inv.path.split("/").at(-1)!, "violet-ledger-51")).rejects.toThrow(/at least 20 characters/);
    const ev = await db("audit_events").where({ action: "lab.settings_changed" }).first();
    expect(JSON.parse(ev!.old_values!)).toMatchObject({ password_min_length: 12 });
    expect(ev!.reason).toBe("policy update");
  });
});

describe("members list on the server", () => {
  it("sorts, filters and pages in SQL, within the lab", async () => {
    const { pageMembers } = await import("@/lib/admin/members");
    const all = await pageMembers(db, admin.labId, { sort: "email", dir: "desc", page: 1, pageSize: 2 });
    expect(all.rows).toHaveLength(2);
    expect(all.total).toBeGreaterThanOrEqual(5);
    expect(all.rows[0]!.email >= all.rows[1]!.email).toBe(true);
    const page2 = await pageMembers(db, admin.labId, { sort: "email", dir: "desc", page: 2, pageSize: 2 });
    expect(page2.rows[0]!.email < all.rows[1]!.email).toBe(true);
    const reviewers = await pageMembers(db, admin.labId, { q: "reviewer", sort: "name", dir: "asc", page: 1, pageSize: 25 });
    expect(reviewers.rows.every((r) => r.role === "reviewer")).toBe(true);
    expect((await pageMembers(db, admin.labId, { q: "fennwick", sort: "name", dir: "asc", page: 1, pageSize: 25 })).total).toBe(0);
  });
});

describe("lab settings", () => {
  it("the upload limit refuses a larger file with 413 and writes nothing", async () => {
    await changeLabSettings(db, admin, { outside_links: false, default_link_days: 14, upload_limit_mb: 1, password_min_length: 12, reason: "small instrument files only" });
    const before = await countIngestRows(db);
    const big = new TextEncoder().encode("Time (s),A\n" + Array.from({ length: 90_000 }, (_, i) => `${i},${(1 - i / 1e5).toFixed(6)}`).join("\n"));
    expect(big.length).toBeGreaterThan(1048576);
    await expect(ingestExport(db, { labId: admin.labId, userId: admin.userId, bytes: big, fileName: "big.csv" })).rejects.toMatchObject({ code: "payload_too_large" });
    expect(await countIngestRows(db)).toEqual(before);
    await changeLabSettings(db, admin, { outside_links: false, default_link_days: 14, upload_limit_mb: 50, password_min_length: 12, reason: "restore" });
  });
});

describe("POST /api/ingest with instrument API keys", () => {
  const file = (name: string) => new File([fs.readFileSync(name)], path.basename(name));
  async function post(key: string | null, f: File, fields: Record<string, string> = {}) {
    const { POST } = await import("@/app/api/ingest/route");
    const form = new FormData();
    form.set("file", f);
    for (const [k, v] of Object.entries(fields)) form.set(k, v);
    const res = await POST(new Request("http://halflight.test/api/ingest", { method: "POST", body: form, headers: key ? { authorization: `Bearer ${key}` } : {} }));
    return { status: res.status, body: await res.json(), headers: res.headers };
  }

  it("stores an export for the key's lab, with metadata, audited under the key, and records the last use", async () => {
    const k = await createApiKey(db, admin, "Bench 2 spectrophotometer");
    expect(k.key).toMatch(/^hlk_/);
    expect(await db("api_keys").where({ id: k.id }).first()).not.toHaveProperty("key_hash", k.key);
    const r = await post(k.key, file("parsers/delimited/fixtures/cv-iso.csv"), { metadata: JSON.stringify({ temperature_c: 30, operator: "bench 2" }) });
    expect(r.status).toBe(201);
    const run = await db("runs").where({ id: r.body.run_id }).first();
    expect(run).toMatchObject({ lab_id: admin.labId, temperature_c: 30, operator: "bench 2", created_by: null });
    const ev = await db("audit_events").where({ action: "run.ingested", object_id: String(r.body.run_id) }).first();
    expect(ev!.actor_label).toMatch(/API key hlk_.*Bench 2 spectrophotometer/);
    expect((await db("api_keys").where({ id: k.id }).first())!.last_used_at).not.toBeNull();
  });

  it("a missing, unknown or revoked key gets 401", async () => {
    expect((await post(null, file("parsers/delimited/fixtures/cv-iso.csv"))).status).toBe(401);
    expect((await post("hlk_not-a-key", file("parsers/delimited/fixtures/cv-iso.csv"))).status).toBe(401);
    const k = await createApiKey(db, admin, "Old bench");
    await revokeApiKey(db, admin, k.id);
    const r = await post(k.key, file("parsers/delimited/fixtures/cv-semicolon-decimal-comma.csv"));
    expect(r.status).toBe(401);
    expect(r.body.error.message).toMatch(/revoked/);
  });

  it("a key of lab A cannot write into lab B: the run lands in the key's own lab whatever the request says", async () => {
    const other = await createApiKey(db, otherAdmin, "Fennwick bench");
    // A lab named in the request is an unknown field: refused (422), not silently ignored.
    const named = await post(other.key, file("parsers/delimited/fixtures/cv-tab-mmss.txt"), { metadata: JSON.stringify({ lab_id: admin.labId }) });
    expect(named.status).toBe(422);
    expect(JSON.stringify(named.body.error.issues)).toMatch(/lab_id/);
    const r = await post(other.key, file("parsers/delimited/fixtures/cv-tab-mmss.txt"));
    expect(r.status).toBe(201);
    expect((await db("runs").where({ id: r.body.run_id }).first())!.lab_id).toBe(otherAdmin.labId);
    expect(await db("runs").where({ lab_id: admin.labId, name: "cv-tab-mmss" }).first()).toBeUndefined();
    // Nor can it attach a method of another lab.
    await db("methods").insert({ lab_id: admin.labId, record_id: null, version: 1, previous_id: null, name: "Larkspur only", analyte: "x", definition: "{}", calibration_id: null, content_hash: "0".repeat(64), reason: null, author_id: admin.userId, created_at: new Date().toISOString() });
    const larkspurMethod = (await db("methods").where({ lab_id: admin.labId }).orderBy("id", "desc").first())!.id;
    const m = await post(other.key, file("parsers/delimited/fixtures/cv-clock-midnight.csv"), { metadata: JSON.stringify({ method_id: larkspurMethod }) });
    expect(m.status).toBe(422);
    expect(m.body.error.message).toMatch(/no method/);
  });

  it("a bad file gets 422 naming the line, and nothing is written", async () => {
    const k = await createApiKey(db, admin, "Bench 3");
    const before = await countIngestRows(db);
    const r = await post(k.key, file("parsers/delimited/fixtures/bad-half-number.csv"));
    expect(r.status).toBe(422);
    expect(r.body.error.line).toBe(4);
    expect(r.body.error.message).toMatch(/"A" holds "0\.5x26", which is not a number/);
    expect(await countIngestRows(db)).toEqual(before);
  });

  it("is rate-limited per key over HTTP: the request past the limit gets 429 with Retry-After", async () => {
    const k = await createApiKey(db, admin, "Chatty bench");
    const statuses: number[] = [];
    for (let i = 0; i < RATE_RULES.apiKeyRequests.points; i++) statuses.push((await post(k.key, file("parsers/delimited/fixtures/cv-iso.csv"))).status);
    expect(new Set(statuses)).toEqual(new Set([200]));
    const over = await post(k.key, file("parsers/delimited/fixtures/cv-iso.csv"));
    expect(over.status).toBe(429);
    expect(Number(over.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(over.body.error.message).toMatch(/Too many requests with this API key: at most 30 in 60 seconds/);
  });
});
