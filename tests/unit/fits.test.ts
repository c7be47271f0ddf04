// Fit records: the server re-runs the engine, hashes content, versions immutably, and exports CSV.
import fs from "node:fs";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { insertLab } from "@/db/queries/labs";
import { insertMembership, insertUser } from "@/db/queries/users";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import { signInWithPassword, type SignedInUser } from "@/lib/auth/sign-in";
import { hashPassword } from "@/lib/auth/password";
import { csvCell, describeChanges } from "@/lib/fits";
import { ingestExport } from "@/lib/ingest";
import { runCli } from "@/lib/cli/main";
import { freshDb, signInAs } from "./../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));
const ctx = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) }) as never;
const CV = "fixtures/published/crystal-violet-590nm.csv";

let db: Knex;
let analyst: SignedInUser;
let runId: number, seriesId: number;

async function postFit(body: unknown) {
  const { POST } = await import("@/app/api/fits/route");
  const res = await POST(new Request("http://halflight.test/api/fits", { method: "POST", body: JSON.stringify(body) }), ctx());
  return { status: res.status, body: await res.json() };
}
async function getJson(path: string, mod: { GET: (r: Request, c: never) => Promise<Response> }, params: Record<string, string>) {
  const res = await mod.GET(new Request(`http://halflight.test${path}`), ctx(params));
  return { status: res.status, res, body: res.headers.get("content-type")?.includes("json") ? await res.json() : await res.text() };
}

beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  analyst = await signInAs(db, "analyst");
  const r = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: new Uint8Array(fs.readFileSync(CV)), fileName: "crystal-violet-590nm.csv" });
  runId = r.run_id;
  seriesId = r.series[0]!.id;
});
beforeEach(() => {
  session.current = analyst;
});
afterAll(() => db.destroy());

describe("saving fits", () => {
  it("the server's stored k equals `cli fit` on the same data and options to 10 digits", async () => {
    const saved = await postFit({ runId, seriesId, title: "CV first order", options: { models: ["linearized", "first-order"] } });
    expect(saved.status).toBe(201);
    const rec = await getJson(`/api/fits/${saved.body.id}`, await import("@/app/api/fits/[id]/route"), { id: String(saved.body.id) });
    const k = rec.body.primary.k;
    const cli = JSON.parse((await runCli(["fit", CV, "--model", "first-order", "--json"])).out!);
    const kCli = cli.parameters.find((p: { name: string }) => p.name === "k").value;
    expect(Math.abs(k / kCli - 1)).toBeLessThan(1e-10);
    expect(rec.body.engine_version).toMatch(/halflight-kinetics/);
    expect(rec.body.results.models.map((m: { model: string }) => m.model)).toEqual(["linearized", "first-order"]);
  });

  it("the same options twice give the same content hash", async () => {
    const options = { models: ["first-order"], fixed: { ainf: 0.04 } };
    const a = await postFit({ runId, seriesId, title: "A", options });
    const b = await postFit({ runId, seriesId, title: "B", options });
    expect(a.body.content_hash).toBe(b.body.content_hash);
    expect(a.body.record_id).not.toBe(b.body.record_id);
  });

  it("a change saves version 2 linked to version 1, needs a reason, and lists what changed", async () => {
    const v1 = await postFit({ runId, seriesId, title: "Versioned", options: { models: ["linearized", "first-order"] } });
    const change = { runId, seriesId, previousId: v1.body.id, options: { models: ["linearized", "first-order"], exclusions: [{ index: 2, reason: "bubble in the cell" }], fixed: { ainf: 0.04 } } };
    const noReason = await postFit(change);
    expect(noReason.status).toBe(422);
    expect(noReason.body.error.message).toMatch(/reason is required/);
    const v2 = await postFit({ ...change, reason: "exclude the bubble; A∞ measured" });
    expect(v2.status).toBe(201);
    expect(v2.body).toMatchObject({ version: 2, record_id: v1.body.record_id });
    const same = await postFit({ ...change, previousId: v2.body.id, reason: "again" });
    expect(same.body).toMatchObject({ unchanged: true, id: v2.body.id });
    const stale = await postFit({ ...change, previousId: v1.body.id, reason: "from an old version" });
    expect(stale.status).toBe(409);
    const versions = await getJson(`/api/fits/${v2.body.id}/versions`, await import("@/app/api/fits/[id]/versions/route"), { id: String(v2.body.id) });
    expect(versions.body.versions.map((v: { version: number }) => v.version)).toEqual([1, 2]);
    expect(versions.body.versions[1].changes).toEqual(["point 3 excluded: “bubble in the cell”", "ainf fixed at 0.04"]);
    expect(versions.body.versions[1].reason).toBe("exclude the bubble; A∞ measured");
    await expect(db("fits").where({ id: v1.body.id }).update({ title: "edited" })).rejects.toThrow(/immutable/);
    const audit = await db("audit_events").where({ action: "fit.version_saved" });
    expect(audit).toHaveLength(1);
    expect(audit[0]!.reason).toBe("exclude the bubble; A∞ measured");

    const csv = await getJson(`/api/fits/${v2.body.id}/export?kind=data`, await import("@/app/api/fits/[id]/export/route"), { id: String(v2.body.id) });
    const rows = (csv.body as string).trim().split("\n");
    expect(rows[1]).toBe("t_s,y,included,exclusion_reason,fitted_first-order,residual_first-order");
    expect(rows[4]).toBe("180,0.526,0,bubble in the cell,,");
    const params = await getJson(`/api/fits/${v2.body.id}/export?kind=parameters`, await import("@/app/api/fits/[id]/export/route"), { id: String(v2.body.id) });
    expect(params.body).toMatch(/^first-order,k,s⁻¹,0\.00\d+/m);
  });

  it("refuses bad options with the field named", async () => {
    const r = await postFit({ runId, seriesId, options: { models: ["first-order"], exclusions: [{ index: 1, reason: "" }] } });
    expect(r.status).toBe(422);
    expect(r.body.error.issues[0].path).toBe("options.exclusions.0.reason");
  });

  it("a user of another lab gets 404 for the fit, and the series", async () => {
    const mine = await postFit({ runId, seriesId, title: "Mine", options: { models: ["first-order"] } });
    const now = new Date().toISOString();
    const lab = await insertLab(db, { slug: "other", name: "Other lab", createdAt: now });
    const u = await insertUser(db, { email: "someone@other.example", displayName: "Someone Else", passwordHash: await hashPassword("other-pass-123"), createdAt: now });
    await insertMembership(db, { userId: u.id, labId: lab.id, role: "analyst", createdAt: now });
    session.current = await signInWithPassword(db, "someone@other.example", "other-pass-123");
    const rec = await getJson(`/api/fits/${mine.body.id}`, await import("@/app/api/fits/[id]/route"), { id: String(mine.body.id) });
    expect(rec.status).toBe(404);
    const save = await postFit({ runId, seriesId, options: { models: ["first-order"] } });
    expect(save.status).toBe(404);
  });
});

describe("own formulas are the method developer's permission", () => {
  const options = { models: ["formula"], formula: "a*exp(-b*t) + c", starts: { a: 1, b: 0.005, c: 0.05 } };
  it("an analyst posting an own formula gets 403 and nothing is stored", async () => {
    const before = (await db("fits").count({ n: "*" }))[0]!.n;
    const r = await postFit({ runId, seriesId, title: "own formula", options });
    expect(r.status).toBe(403);
    expect(r.body.error.message).toMatch(/open to method developers/);
    expect((await db("fits").count({ n: "*" }))[0]!.n).toBe(before);
  });
  it("a method developer may", async () => {
    session.current = await signInAs(db, "method_developer");
    const r = await postFit({ runId, seriesId, title: "own formula", options });
    expect(r.status).toBe(201);
  });
});

describe("csv cells", () => {
  it("escapes text that a spreadsheet would run as a formula (OWASP CSV injection guidance)", () => {
    expect(csvCell("=HYPERLINK(1)")).toBe("'=HYPERLINK(1)");
    expect(csvCell("+1")).toBe("'+1");
    expect(csvCell("@sum")).toBe("'@sum");
    expect(csvCell("-2")).toBe("'-2");
    expect(csvCell(-2)).toBe("-2");
    expect(csvCell('a,"b"')).toBe('"a,""b"""');
  });
  it("describes changes in plain words", () => {
    expect(describeChanges({ models: ["first-order"] }, { models: ["first-order"], window: { from: 60, to: null } })).toEqual(["fitting window 60–end s"]);
  });
});
