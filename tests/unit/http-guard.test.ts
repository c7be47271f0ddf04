// The HTTP surface under hostile input: writes only from the app's own pages, bodies bounded before they are read,
// any file name downloadable. Through the route handlers, rows counted before and after each refusal.
import fs from "node:fs";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { attachment } from "@/lib/http/download";
import { JSON_BODY_LIMIT } from "@/lib/http/json-body";
import { ingestExport } from "@/lib/ingest";
import { freshDb, signInAs } from "../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));
const ctx = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) }) as never;
const APP = "http://halflight.test";

let db: Knex;
let analyst: SignedInUser;
let runId: number, seriesId: number, rawFileId: number;
const UNICODE_NAME = "Ωmega-測定-ü.csv";

beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  analyst = await signInAs(db, "analyst");
  const r = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: new Uint8Array(fs.readFileSync("fixtures/published/crystal-violet-590nm.csv")), fileName: UNICODE_NAME });
  runId = r.run_id;
  seriesId = r.series[0]!.id;
  rawFileId = (await db("runs").where({ id: runId }).first())!.raw_file_id;
});
beforeEach(() => {
  session.current = analyst;
});
afterAll(() => db.destroy());

const fits = async () => Number((await db("fits").count({ n: "*" }))[0]!.n);
async function postFit(headers: Record<string, string>, body: string | ReadableStream<Uint8Array>) {
  const { POST } = await import("@/app/api/fits/route");
  const req = new Request(`${APP}/api/fits`, { method: "POST", headers, body, ...(typeof body === "string" ? {} : { duplex: "half" }) } as RequestInit);
  const res = await POST(req, ctx());
  return { status: res.status, body: await res.json(), req };
}
const fitBody = () => JSON.stringify({ runId, seriesId, title: "guard", options: { models: ["first-order"] } });

describe("writes only from the app's own pages (OWASP CSRF prevention: origin checks and non-simple content types)", () => {
  it("a foreign Origin (another port of the same host) gets 403 and nothing is written", async () => {
    const before = await fits();
    const r = await postFit({ origin: "http://halflight.test:4000", "content-type": "application/json" }, fitBody());
    expect(r.status).toBe(403);
    expect(r.body.error.message).toMatch(/only from Halflight's own pages/);
    expect(await fits()).toBe(before);
  });
  it("a sibling site (Sec-Fetch-Site: same-site) gets 403", async () => {
    const r = await postFit({ "sec-fetch-site": "same-site", "content-type": "application/json" }, fitBody());
    expect(r.status).toBe(403);
  });
  it("text/plain from a browser gets 403, even from the app's origin", async () => {
    const before = await fits();
    const r = await postFit({ origin: APP, "content-type": "text/plain;charset=UTF-8" }, fitBody());
    expect(r.status).toBe(403);
    expect(r.body.error.message).toMatch(/as JSON/);
    expect(await fits()).toBe(before);
  });
  it("the app's own request works", async () => {
    const r = await postFit({ origin: APP, "sec-fetch-site": "same-origin", "content-type": "application/json" }, fitBody());
    expect(r.status).toBe(201);
  });
});

describe("bodies are bounded before they are read", () => {
  it("a declared body over the limit is answered 413 without reading it", async () => {
    const before = await fits();
    const big = "x".repeat(JSON_BODY_LIMIT + 10);
    const r = await postFit({ "content-type": "application/json", "content-length": String(big.length) }, big);
    expect(r.status).toBe(413);
    expect(r.req.bodyUsed).toBe(false);
    expect(await fits()).toBe(before);
  });
  it("a streamed body with no length is cut off at the limit", async () => {
    let sent = 0;
    const chunk = new Uint8Array(64 * 1024).fill(32);
    const stream = new ReadableStream<Uint8Array>({
      pull(c) {
        sent += chunk.byteLength;
        if (sent > 64 * 1024 * 1024) c.close();
        else c.enqueue(chunk);
      },
    });
    const r = await postFit({ "content-type": "application/json" }, stream);
    expect(r.status).toBe(413);
    // Stopped soon after the limit, not after 64 MB.
    expect(sent).toBeLessThan(JSON_BODY_LIMIT + 4 * chunk.byteLength);
  });
});

describe("any file name downloads (RFC 6266 / RFC 8187 filename*)", () => {
  it("a name outside Latin-1 round-trips byte for byte, and so do the file's bytes", async () => {
    const { GET } = await import("@/app/api/raw-files/[id]/route");
    const res = await GET(new Request(`${APP}/api/raw-files/${rawFileId}`), ctx({ id: String(rawFileId) }));
    expect(res.status).toBe(200);
    const cd = res.headers.get("content-disposition")!;
    const star = cd.match(/filename\*=UTF-8''([^;]+)/)![1]!;
    expect(Buffer.from(decodeURIComponent(star), "utf8").equals(Buffer.from(UNICODE_NAME, "utf8"))).toBe(true);
    expect(cd).toMatch(/^attachment; filename="[\x20-\x7e]+"/);
    expect(Buffer.from(await res.arrayBuffer()).equals(fs.readFileSync("fixtures/published/crystal-violet-590nm.csv"))).toBe(true);
  });
  it("quotes and backslashes cannot break out of the header", () => {
    expect(attachment('a"b\\c.csv')).toBe(`attachment; filename="a_b_c.csv"; filename*=UTF-8''a%22b%5Cc.csv`);
  });
});

describe("bodies are bounded in shape (strict schemas, counted arrays and records, no control characters)", () => {
  const base = () => ({ runId, seriesId, title: "shape", options: { models: ["first-order"] } });
  const post = async (body: unknown) => postFit({ "content-type": "application/json" }, JSON.stringify(body));
  it("unknown keys in the options or the body are refused with 422 and nothing is stored", async () => {
    const before = await fits();
    const junk = Object.fromEntries(Array.from({ length: 500 }, (_, i) => [`k${i}`, i]));
    expect((await post({ ...base(), options: { models: ["first-order"], ...junk } })).status).toBe(422);
    expect((await post({ ...base(), extra: true })).status).toBe(422);
    expect(await fits()).toBe(before);
  });
  it("more than 12 fixed values, or a name that is not a parameter name, is refused", async () => {
    const fixed = Object.fromEntries(Array.from({ length: 13 }, (_, i) => [`p${i}`, 1]));
    const r = await post({ ...base(), options: { models: ["first-order"], fixed } });
    expect(r.status).toBe(422);
    expect(JSON.stringify(r.body)).toMatch(/At most 12 parameter values/);
    expect((await post({ ...base(), options: { models: ["first-order"], starts: { "a b": 1 } } })).status).toBe(422);
  });
  it("more than 10,000 point-by-point exclusions are refused (a window does that job)", async () => {
    const exclusions = Array.from({ length: 10_001 }, (_, i) => ({ index: i, reason: "bad" }));
    expect((await post({ ...base(), options: { models: ["first-order"], exclusions } })).status).toBe(422);
  });
  it("a title with a control character (a NUL) is refused with its field named", async () => {
    const r = await post({ ...base(), title: "cell\u0000 1" });
    expect(r.status).toBe(422);
    expect(JSON.stringify(r.body)).toMatch(/control characters/);
  });
});
