// Review and sign-off (21 CFR 11.10(f),(g), 11.50, 11.70, 11.200 as summarised in METHODS.md "Compliance"): the
// sequence is enforced, signatures re-ask the password and bind the content hash, an author never approves their own
// record, and the audit chain shows tampering.
import fs from "node:fs";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { signInWithPassword, type SignedInUser } from "@/lib/auth/sign-in";
import { saveFit } from "@/lib/fits";
import { ingestExport } from "@/lib/ingest";
import { reviewQueue, reviewStatus } from "@/lib/reviews";
import { freshDb, liftGuards } from "./../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));
const ctx = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) }) as never;

let db: Knex;
const as: Record<string, SignedInUser> = {};
const pw = (role: string) => DEMO_USERS.find((u) => u.role === role)!.password;
let fitId: number;

async function post(route: "submit" | "decision" | "withdraw" | "comments", id: number, body: unknown) {
  const mod = await import(`@/app/api/fits/[id]/${route}/route`);
  const res = await mod.POST(new Request(`http://halflight.test/api/fits/${id}/${route}`, { method: "POST", body: JSON.stringify(body) }), ctx({ id: String(id) }));
  return { status: res.status, body: await res.json() };
}

beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  for (const u of DEMO_USERS) as[u.role] = await signInWithPassword(db, u.email, u.password);
  const r = await ingestExport(db, { labId: as.analyst!.labId, userId: as.analyst!.userId, bytes: new Uint8Array(fs.readFileSync("fixtures/published/crystal-violet-590nm.csv")), fileName: "cv.csv" });
  fitId = (await saveFit(db, as.analyst!, { runId: r.run_id, seriesId: r.series[0]!.id, title: "CV", options: { models: ["first-order"] } })).id;
});
beforeEach(() => {
  session.current = as.analyst!;
});
afterAll(() => db.destroy());

describe("review sequence", () => {
  it("no approval before submission", async () => {
    session.current = as.reviewer!;
    const r = await post("decision", fitId, { decision: "approved", password: pw("reviewer") });
    expect(r.status).toBe(409);
    expect(r.body.error.message).toMatch(/Only a submitted version can be approved/);
  });

  it("submitting with a wrong password fails, is audited, and makes no signature", async () => {
    const r = await post("submit", fitId, { password: "not-mine" });
    expect(r.status).toBe(401);
    expect(r.body.error.message).toMatch(/password is not right: the signature was not made/);
    expect(Number((await db("signatures").count({ n: "*" }))[0]!.n)).toBe(0);
    expect(await db("audit_events").where({ action: "signature.refused" })).toHaveLength(1);
  });

  it("the author submits (signed: authored); the author cannot approve; the reviewer approves with the password", async () => {
    const s = await post("submit", fitId, { password: pw("analyst") });
    expect(s.status).toBe(200);
    expect((await reviewQueue(db, as.reviewer!.labId)).map((q) => q.id)).toEqual([fitId]);

    // A method developer is not a reviewer; the author is not the reviewer either.
    session.current = as.method_developer!;
    expect((await post("decision", fitId, { decision: "approved", password: pw("method_developer") })).status).toBe(403);

    session.current = as.reviewer!;
    const wrong = await post("decision", fitId, { decision: "approved", password: "guess" });
    expect(wrong.status).toBe(401);
    const refused = await db("audit_events").where({ action: "signature.refused" }).orderBy("id");
    expect(refused.at(-1)).toMatchObject({ actor_user_id: as.reviewer!.userId, reason: "wrong password when signing: approved" });
    const noReason = await post("decision", fitId, { decision: "rejected", password: pw("reviewer") });
    expect(noReason.status).toBe(422);
    await post("comments", fitId, { body: "A∞ agrees with the measured 0.040 within its CI." });
    const ok = await post("decision", fitId, { decision: "approved", password: pw("reviewer") });
    expect(ok.status).toBe(200);

    const status = await reviewStatus(db, as.reviewer!.labId, fitId);
    expect(status.state).toBe("approved");
    expect(status.signatures.map((x) => [x.printed_name, x.meaning, x.void])).toEqual([
      ["Amara Quist", "authored", false],
      ["Rafe Okonkwo", "approved", false],
    ]);
    const fit = await db("fits").where({ id: fitId }).first();
    expect(status.signatures.every((x) => x.content_hash === fit!.content_hash)).toBe(true);
    expect(await reviewQueue(db, as.reviewer!.labId)).toEqual([]);
  });

  it("a change makes a new draft version and the old approval shows superseded", async () => {
    const v2 = await saveFit(db, as.analyst!, { runId: (await db("fits").where({ id: fitId }).first())!.run_id, seriesId: (await db("fits").where({ id: fitId }).first())!.series_id, previousId: fitId, reason: "fix A∞", options: { models: ["first-order"], fixed: { ainf: 0.04 } } });
    const old = await reviewStatus(db, as.analyst!.labId, fitId);
    expect(old.superseded_by).toEqual({ id: v2.id, version: 2 });
    expect((await reviewStatus(db, as.analyst!.labId, v2.id)).state).toBe("draft");
    // The superseded version cannot be submitted again.
    expect((await post("submit", fitId, { password: pw("analyst") })).status).toBe(409);
  });

  it("an author never approves their own record, even holding the reviewer role", async () => {
    // A reviewer who authored a record (possible only by data from elsewhere): segregation of duties still holds.
    const own = await saveFit(db, { ...as.reviewer!, role: "analyst" }, { runId: 1, seriesId: 1, title: "Reviewer's own", options: { models: ["first-order"] } });
    session.current = { ...as.reviewer!, role: "analyst" };
    await post("submit", own.id, { password: pw("reviewer") });
    session.current = as.reviewer!;
    const r = await post("decision", own.id, { decision: "approved", password: pw("reviewer") });
    expect(r.status).toBe(403);
    expect(r.body.error.message).toMatch(/someone else must review it/);
  });
});

describe("audit verification", () => {
  it("GET /api/audit/verify reports the first tampered row", async () => {
    session.current = as.admin!;
    const { GET } = await import("@/app/api/audit/verify/route");
    const ok = await (await GET(new Request("http://halflight.test/api/audit/verify"), ctx())).json();
    expect(ok).toMatchObject({ intact: true, first_broken_row: null, problems: [] });
    const victim = await db("audit_events").where({ action: "fit.approved" }).first();
    await liftGuards(db, "audit_events");
    await db("audit_events").where({ id: victim!.id }).update({ reason: "rewritten later" });
    const bad = await (await GET(new Request("http://halflight.test/api/audit/verify"), ctx())).json();
    expect(bad).toMatchObject({ intact: false, first_broken_row: victim!.id });
    expect(bad.problems[0]).toMatch(new RegExp(`Row ${victim!.id} has been changed`));
  });
});

describe("audit trail export", () => {
  it("filters by action and exports CSV with formula-safe text", async () => {
    session.current = as.admin!;
    const { GET } = await import("@/app/api/audit/route");
    const json = await (await GET(new Request("http://halflight.test/api/audit?action=fit.&limit=50"), ctx())).json();
    expect(json.events.length).toBeGreaterThan(0);
    expect(json.events.every((e: { action: string }) => e.action.startsWith("fit."))).toBe(true);
    const csv = await (await GET(new Request("http://halflight.test/api/audit?format=csv&action=comment."), ctx())).text();
    expect(csv.split("\n")[0]).toBe("id,at_utc,who,action,object_type,object_id,object_version,reason,old_values,new_values,hash");
    expect(csv).toMatch(/comment\.added/);
  });
});
