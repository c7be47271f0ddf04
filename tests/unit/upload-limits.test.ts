// Uploads bounded before and while they are read: the declared size before a byte is read, the parsers' limits at the
// first line that passes them (with its number), and nothing stored in any refusal (rows counted before and after).
// The limits themselves are the product's (parsers/limits.ts); the hostile files are the ones a security review
// of an upload endpoint tries as common practice (one huge line, a file of newlines, a DUP count of a billion).
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { countIngestRows } from "@/db/queries/runs";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { INGEST_LIMITS } from "@/lib/ingest";
import { parseExport, ParseError } from "@/parsers";
import { PARSE_LIMITS } from "@/parsers/limits";
import { checkTextShape } from "@/parsers/text";
import { freshDb, onPostgres, signInAs } from "../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));
const ctx = () => ({ params: Promise.resolve({}) }) as never;
const APP = "http://halflight.test";

let db: Knex;
let analyst: SignedInUser;
beforeAll(async () => {
  db = await freshDb();
  setDb(db);
  await seedDemoWhenEmpty(db);
  analyst = await signInAs(db, "analyst");
});
beforeEach(() => {
  session.current = analyst;
});
afterAll(() => db.destroy());

function formOf(name: string, text: string): FormData {
  const form = new FormData();
  form.set("file", new File([text], name, { type: "text/csv" }));
  return form;
}
async function upload(route: "uploads" | "runs", form: FormData) {
  const mod = route === "uploads" ? await import("@/app/api/uploads/route") : await import("@/app/api/runs/route");
  const req = new Request(`${APP}/api/${route}`, { method: "POST", headers: { origin: APP, "sec-fetch-site": "same-origin" }, body: form });
  const res = await mod.POST(req, ctx());
  return { status: res.status, body: (await res.json()) as { error?: { message: string; line?: number } } };
}

describe("the parsers refuse at the first line past a limit", () => {
  it("a CSV of 1,000,000 columns is refused at line 1, before it is split into cells, and nothing is stored", async () => {
    const before = await countIngestRows(db);
    const text = "t," + Array.from({ length: 1_000_000 }, (_, i) => `c${i}`).join(",") + "\n0," + "0.5,".repeat(999_999) + "0.5\n";
    const r = await upload("runs", formOf("wide.csv", text));
    expect(r.status).toBe(422);
    expect(r.body.error!.line).toBe(1);
    expect(r.body.error!.message).toMatch(/wide\.csv: line 1: the line is [\d,]+ characters long; a line may hold at most 65,536/);
    expect(await countIngestRows(db)).toEqual(before);
  });
  it("a table of 200 channels (short cells, lines within the length limit) is refused at its first data row", async () => {
    const head = ["t", ...Array.from({ length: 200 }, (_, i) => `A${i}`)].join(",");
    const row = (t: number) => [t, ...Array.from({ length: 200 }, () => "0.5")].join(",");
    const r = await upload("uploads", formOf("many.csv", [head, row(0), row(1)].join("\n")));
    expect(r.status).toBe(422);
    expect(r.body.error!.line).toBe(2);
    expect(r.body.error!.message).toMatch(/the table has 200 channels; an export may hold at most 96/);
  });
  it("a file of newlines is refused at the first line past the line limit, not split into millions of strings", async () => {
    const before = await countIngestRows(db);
    const r = await upload("runs", formOf("blank.csv", "\n".repeat(PARSE_LIMITS.maxLines + 10)));
    expect(r.status).toBe(422);
    expect(r.body.error!.line).toBe(PARSE_LIMITS.maxLines + 1);
    expect(r.body.error!.message).toMatch(/more than 5,010,000 lines/);
    expect(await countIngestRows(db)).toEqual(before);
  });
  it("readings past the points limit are refused at the row that passes it", () => {
    const channels = PARSE_LIMITS.maxChannels;
    const rows = Math.floor(PARSE_LIMITS.maxPoints / channels);
    const one = "," + Array.from({ length: channels }, () => "1").join(",");
    const lines = ["t," + Array.from({ length: channels }, (_, i) => `A${i}`).join(",")];
    for (let r = 0; r <= rows; r++) lines.push(r + one);
    const out = parseExport(new TextEncoder().encode(lines.join("\n")), "long.csv");
    expect(out).toBeInstanceOf(ParseError);
    // Header on line 1, row r on line r + 2: the refused row is the (rows + 1)-th.
    expect((out as ParseError).line).toBe(rows + 2);
    expect((out as ParseError).message).toMatch(/more than 5,000,000 readings \(96 channels × 52,083 rows\)/);
  });
  it("a JCAMP-DX DUP count of a billion is refused on its line before the repeats are made", () => {
    const jdx = ["##TITLE=dup", "##JCAMP-DX=4.24", "##XUNITS=SECONDS", "##YUNITS=ABSORBANCE", "##XFACTOR=1", "##YFACTOR=1", "##FIRSTX=0", "##LASTX=1", "##NPOINTS=2", "##XYDATA=(X++(Y..Y))", "0 1Z999999999", "##END="].join("\n");
    const out = parseExport(new TextEncoder().encode(jdx), "dup.jdx");
    expect(out).toBeInstanceOf(ParseError);
    expect((out as ParseError).line).toBe(11);
    expect((out as ParseError).message).toMatch(/more than 5,000,000 readings/);
  });
  it("the shape check counts CRLF and CR line ends as one line each and names the long line", () => {
    expect(() => checkTextShape("a\r\nb\rccc\n", { maxLineChars: 3, maxLines: 10 })).not.toThrow();
    expect(() => checkTextShape("a\r\nb\rcccc\n", { maxLineChars: 3, maxLines: 10 })).toThrow(/line 3: the line is 4 characters long/);
    expect(() => checkTextShape("a\nb\nc\nd", { maxLineChars: 3, maxLines: 3 })).toThrow(/line 4: the file has more than 3 lines/);
    expect(() => checkTextShape("a\nb\nc\n", { maxLineChars: 3, maxLines: 3 })).not.toThrow();
  });
});

describe("uploads bounded before they are read", () => {
  it("a declared 60 MB upload is answered 413 without reading its body, and nothing is stored", async () => {
    const before = await countIngestRows(db);
    const { POST } = await import("@/app/api/runs/route");
    let pulled = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(c) {
        pulled++;
        c.enqueue(new Uint8Array(65536));
      },
    });
    const req = new Request(`${APP}/api/runs`, {
      method: "POST",
      headers: { origin: APP, "content-type": "multipart/form-data; boundary=x", "content-length": String(60 * 1048576) },
      body,
      duplex: "half",
    } as RequestInit);
    const res = await POST(req, ctx());
    expect(res.status).toBe(413);
    expect((await res.json()).error.message).toMatch(/over the limit of 50 MB per file; nothing was read or stored/);
    expect(req.bodyUsed).toBe(false);
    expect(pulled).toBeLessThanOrEqual(1); // the stream's first pull happens when it is created, not read
    expect(await countIngestRows(db)).toEqual(before);
  });
  it("an upload with no declared length is cut off just past the lab's limit", async () => {
    const { POST } = await import("@/app/api/uploads/route");
    let sent = 0;
    const chunk = new Uint8Array(256 * 1024).fill(49);
    const body = new ReadableStream<Uint8Array>({
      pull(c) {
        sent += chunk.byteLength;
        if (sent > 80 * 1048576) c.close();
        else c.enqueue(chunk);
      },
    });
    const req = new Request(`${APP}/api/uploads`, { method: "POST", headers: { origin: APP, "content-type": "multipart/form-data; boundary=x" }, body, duplex: "half" } as RequestInit);
    const res = await POST(req, ctx());
    expect(res.status).toBe(413);
    // Read up to the limit (the whole limit, since no length was declared), then refused: not the 80 MB sent.
    expect(sent).toBeGreaterThan(INGEST_LIMITS.maxBytes);
    expect(sent).toBeLessThan(INGEST_LIMITS.maxBytes + 1048576 + 4 * chunk.byteLength);
  });
  it("a lab's own lower limit applies before the body is read", async () => {
    const had = await db("lab_settings").where({ lab_id: analyst.labId }).first();
    if (had) await db("lab_settings").where({ lab_id: analyst.labId }).update({ upload_limit_mb: 1 });
    else await db("lab_settings").insert({ lab_id: analyst.labId, outside_links: false, default_link_days: 14, upload_limit_mb: 1, password_min_length: 12, updated_at: new Date().toISOString() });
    try {
      const { POST } = await import("@/app/api/uploads/route");
      const req = new Request(`${APP}/api/uploads`, { method: "POST", headers: { origin: APP, "content-type": "multipart/form-data; boundary=x", "content-length": String(3 * 1048576) }, body: "x" });
      const res = await POST(req, ctx());
      expect(res.status).toBe(413);
      expect((await res.json()).error.message).toMatch(/limit of 1 MB per file/);
    } finally {
      if (had) await db("lab_settings").where({ lab_id: analyst.labId }).update({ upload_limit_mb: had.upload_limit_mb });
      else await db("lab_settings").where({ lab_id: analyst.labId }).delete();
    }
  });
  it("a request that is not multipart is a 400 naming what to send", async () => {
    const r = await upload("uploads", formOf("ok.csv", "t,A\n0,1\n1,0.5\n"));
    expect(r.status).toBe(200);
    const { POST } = await import("@/app/api/uploads/route");
    const res = await POST(new Request(`${APP}/api/uploads`, { method: "POST", headers: { origin: APP, "content-type": "application/json" }, body: "{}" }), ctx());
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toMatch(/not a multipart form upload/);
  });
});

describe.skipIf(onPostgres)("storage that cannot take a write is said in plain words, and nothing is half-written (SQLite: max_page_count, query_only)", () => {
  const csv = (tag: string) => `Time (s),A 590 nm\n0,1.0\n10,0.8\n20,0.64\n30,0.51\n# ${tag}\n`;
  it("a full disk (SQLite's max_page_count reached) answers 507 and stores nothing", async () => {
    const before = await countIngestRows(db);
    const pages = Number((await db.raw("PRAGMA page_count"))[0].page_count);
    await db.raw(`PRAGMA max_page_count = ${pages}`);
    try {
      const rows = Array.from({ length: 20_000 }, (_, i) => `${i},${Math.exp(-i / 5000).toFixed(6)}`);
      const r = await upload("runs", formOf("full.csv", ["Time (s),A 590 nm", ...rows].join("\n")));
      expect(r.status).toBe(507);
      expect(r.body.error!.message).toMatch(/disk is full, so nothing was saved/);
    } finally {
      await db.raw("PRAGMA max_page_count = 4294967294");
    }
    expect(await countIngestRows(db)).toEqual(before);
  });
  it("a database that has become read-only answers 503 with Retry-After and stores nothing", async () => {
    const before = await countIngestRows(db);
    await db.raw("PRAGMA query_only = ON");
    try {
      const { POST } = await import("@/app/api/runs/route");
      const form = formOf("ro.csv", csv("ro"));
      const res = await POST(new Request(`${APP}/api/runs`, { method: "POST", headers: { origin: APP }, body: form }), ctx());
      expect(res.status).toBe(503);
      expect(res.headers.get("retry-after")).toBe("60");
      expect((await res.json()).error.message).toMatch(/cannot be written at the moment \(it is read-only\), so nothing was saved/);
    } finally {
      await db.raw("PRAGMA query_only = OFF");
    }
    expect(await countIngestRows(db)).toEqual(before);
  });
});

describe("PostgreSQL's storage refusals map to the same answers", () => {
  // The codes are PostgreSQL's SQLSTATEs (53100 disk_full, 25006 read_only_sql_transaction, 40001 serialization
  // failure); the errors here are built by hand, since a full disk cannot be made on demand.
  it.each([
    ["53100", 507, /disk is full/],
    ["25006", 503, /read-only/],
    ["40001", 503, /busy/],
  ])("SQLSTATE %s answers %i", async (code, status, words) => {
    const { toErrorResponse } = await import("@/lib/http/errors");
    const res = toErrorResponse(Object.assign(new Error("insert into x - refused"), { code }));
    expect(res.status).toBe(status);
    expect((await res.json()).error.message).toMatch(words);
  });
});
