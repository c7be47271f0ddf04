// Ingest end to end over HTTP handlers: previews, storing, duplicates, the original bytes, and refused input
// (a clear message, the line, a 4xx, nothing written).
import fs from "node:fs";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { setDb } from "@/db";
import { countIngestRows } from "@/db/queries/runs";
import { seedDemoWhenEmpty } from "@/db/seeds/demo";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { verifyAuditChain } from "@/lib/audit";
import { ingestExport, INGEST_LIMITS, sha256Hex, startReadExport } from "@/lib/ingest";
import { readSeries } from "@/lib/runs";
import { failInserts, freshDb, signInAs } from "./../helpers/db";

const session = vi.hoisted(() => ({ current: null as SignedInUser | null }));
vi.mock("@/lib/auth/session", () => ({ getSessionUser: async () => session.current }));

const FIX = "parsers/delimited/fixtures";
// Route contexts differ per route; the handlers only await `params`.
const ctx = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) }) as never;
let db: Knex;
let analyst: SignedInUser;

function form(file: string | { name: string; bytes: Uint8Array }, extra: Record<string, string> = {}) {
  const f = new FormData();
  const { name, bytes } = typeof file === "string" ? { name: file.split("/").pop()!, bytes: fs.readFileSync(file) } : file;
  f.set("file", new File([new Uint8Array(bytes)], name));
  for (const [k, v] of Object.entries(extra)) f.set(k, v);
  return f;
}

async function post(route: "uploads" | "runs", body: FormData) {
  const mod = route === "uploads" ? await import("@/app/api/uploads/route") : await import("@/app/api/runs/route");
  const res = await mod.POST(new Request(`http://halflight.test/api/${route}`, { method: "POST", body }), ctx());
  return { status: res.status, body: await res.json() };
}

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

describe("preview and store", () => {
  it("POST /api/uploads previews without writing anything", async () => {
    const before = await countIngestRows(db);
    const r = await post("uploads", form(`${FIX}/cv-clock-midnight.csv`));
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ parser: "delimited", name: "cv-clock-midnight.csv", existing: null, suggested: { temperature_c: 25 } });
    expect(r.body.series.map((s: { name: string; points: number }) => [s.name, s.points])).toEqual([["Cell 1 (A)", 9], ["Cell 2 (A)", 7]]);
    expect(r.body.head[1].text).toBe("Clock time,Cell 1 (A),Cell 2 (A)");
    expect(await countIngestRows(db)).toEqual(before);
  });

  it("the preview offers the operator and sample the file names, and the first readings exactly as they will be stored", async () => {
    const text = "Operator: J. Pell\nSample ID: Lot 42-B\nWavelength: 590 nm\nTime (min),A\n0,0.812\n0.5,0.701\n1,0.604\n1.5,0.52\n2,0.449\n";
    const r = await post("uploads", form({ name: "pell-lot42.csv", bytes: new TextEncoder().encode(text) }));
    expect(r.status).toBe(200);
    expect(r.body.suggested).toMatchObject({ operator: "J. Pell", sample: "Lot 42-B", wavelength_nm: 590 });
    // Minutes read as seconds: the check the analyst makes by eye against the raw lines.
    expect(r.body.series[0].first_t).toEqual([0, 30, 60, 90, 120]);
    expect(r.body.series[0].first_y).toEqual([0.812, 0.701, 0.604, 0.52, 0.449]);
  });

  it("POST /api/runs stores raw file, run, series and one audit event; the same file again is offered, not duplicated", async () => {
    const file = `${FIX}/cv-semicolon-decimal-comma.csv`;
    const bytes = new Uint8Array(fs.readFileSync(file));
    const before = await countIngestRows(db);
    const mapping = JSON.stringify({ run: { name: "Corvane blue 25 °C", study: "Stability A", sample: "lot 7" }, channels: [{ source: "Abs", name: "Cell 1" }] });
    const r = await post("runs", form(file, { mapping, sha256: sha256Hex(bytes) }));
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ existing: false, raw_file_sha256: sha256Hex(bytes), series: [{ name: "Cell 1", points: 9 }] });
    const after = await countIngestRows(db);
    expect(after).toEqual({ raw_files: before.raw_files + 1, runs: before.runs + 1, series: before.series + 1, audit_events: before.audit_events + 1 });

    const { GET } = await import("@/app/api/runs/[id]/route");
    const detail = await (await GET(new Request("http://halflight.test/api/runs/x"), ctx({ id: String(r.body.run_id) }))).json();
    expect(detail).toMatchObject({ name: "Corvane blue 25 °C", study: "Stability A", sample: "lot 7", wavelength_nm: 590, path_length_cm: 1, temperature_c: 24.6 });

    const again = await post("uploads", form(file));
    expect(again.body.existing).toMatchObject({ run_id: r.body.run_id });
    const stored = await post("runs", form(file));
    expect(stored.status).toBe(200);
    expect(stored.body).toMatchObject({ existing: true, run_id: r.body.run_id });
    expect(await countIngestRows(db)).toEqual(after);

    // The original bytes come back unchanged, with their SHA-256.
    const raw = await import("@/app/api/raw-files/[id]/route");
    const res = await raw.GET(new Request("http://halflight.test/api/raw-files/x"), ctx({ id: String(detail.raw_file.id) }));
    const back = new Uint8Array(await res.arrayBuffer());
    expect(Buffer.compare(Buffer.from(back), Buffer.from(bytes))).toBe(0);
    expect(res.headers.get("x-content-sha256")).toBe(sha256Hex(bytes));
    expect(await verifyAuditChain(db)).toBeNull();
  });

  it("stores every point exactly (16 bytes per point) and decimates only for display", async () => {
    const n = 50_000;
    const lines = ["Time (s),A"];
    for (let i = 0; i < n; i++) lines.push(`${i * 0.1},${(0.05 + 0.9 * Math.exp(-0.0004 * i)).toFixed(6)}`);
    const bytes = new TextEncoder().encode(lines.join("\n"));
    const r = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes, fileName: "long.csv" });
    const { t, y, row } = await readSeries(db, analyst.labId, r.run_id, r.series[0]!.id);
    expect(t.length).toBe(n);
    expect(t[12345]).toBe(1234.5);
    expect(y[n - 1]).toBe(Number((0.05 + 0.9 * Math.exp(-0.0004 * (n - 1))).toFixed(6)));
    expect(row.t_f64.byteLength + row.y_f64.byteLength).toBe(16 * n);
    const { GET } = await import("@/app/api/runs/[id]/series/[sid]/route");
    const res = await GET(new Request(`http://halflight.test/api/runs/${r.run_id}/series/${r.series[0]!.id}?maxPoints=500`), ctx({ id: String(r.run_id), sid: String(r.series[0]!.id) }));
    const body = await res.json();
    expect(body.t.length).toBeLessThanOrEqual(500);
    expect(body.t.length).toBeGreaterThan(250);
    expect(body.decimated).toEqual({ method: "min/max per bucket", shown: body.t.length });
    expect(body.points).toBe(n);
    // Every point for fitting, as binary: n little-endian float64 times, then n readings, equal to the stored arrays.
    const bin = await import("@/app/api/runs/[id]/series/[sid]/points/route");
    const raw = await bin.GET(new Request(`http://halflight.test/api/runs/${r.run_id}/series/${r.series[0]!.id}/points`), ctx({ id: String(r.run_id), sid: String(r.series[0]!.id) }));
    expect(raw.headers.get("content-type")).toBe("application/octet-stream");
    expect(raw.headers.get("x-series-points")).toBe(String(n));
    const buf = await raw.arrayBuffer();
    expect(buf.byteLength).toBe(16 * n);
    const view = new DataView(buf);
    for (const i of [0, 1, 12345, n - 1]) {
      expect(view.getFloat64(8 * i, true)).toBe(t[i]);
      expect(view.getFloat64(8 * (n + i), true)).toBe(y[i]);
    }
    expect(Buffer.from(buf).equals(Buffer.concat([Buffer.from(row.t_f64), Buffer.from(row.y_f64)]))).toBe(true);
    // JSON of every point is no longer offered: the display view is bounded.
    const big = await GET(new Request(`http://halflight.test/api/runs/${r.run_id}/series/${r.series[0]!.id}?maxPoints=2000000`), ctx({ id: String(r.run_id), sid: String(r.series[0]!.id) }));
    expect(big.status).toBe(422);
  });

  it("a parse started before the database is ready (the command line's way) stores the same series; refused input is still refused with its line", async () => {
    // Three channels of one table: the byte-level reader gives them one array of times; each is stored as its own BLOB.
    const lines = ["Time (s),A (A),B (A),C (A)"];
    for (let i = 0; i < 2000; i++) lines.push(`${i},${(1 - i / 4000).toFixed(5)},${(0.5 + i / 8000).toFixed(5)},${(i % 7) / 10}`);
    const bytes = new TextEncoder().encode(lines.join("\n") + "\n");
    const parsing = startReadExport(bytes, "three.csv");
    const r = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes, fileName: "three.csv", parsing });
    expect(r.series.map((s) => [s.name, s.points])).toEqual([["A (A)", 2000], ["B (A)", 2000], ["C (A)", 2000]]);
    for (const [k, s] of r.series.entries()) {
      const { t, y } = await readSeries(db, analyst.labId, r.run_id, s.id);
      expect(t[1999]).toBe(1999);
      expect(y[1999]).toBe(k === 0 ? Number((1 - 1999 / 4000).toFixed(5)) : k === 1 ? Number((0.5 + 1999 / 8000).toFixed(5)) : (1999 % 7) / 10);
    }
    // The same file again: the stored run, whatever the early parse gave.
    const again = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes, fileName: "three.csv", parsing: startReadExport(bytes, "three.csv") });
    expect(again).toMatchObject({ existing: true, run_id: r.run_id });
    const before = await countIngestRows(db);
    const bad = new TextEncoder().encode("Time (s),A\n0,1\n1,0.5\n2,oops\n3,\n4,zz,9\n");
    await expect(ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: bad, fileName: "bad.csv", parsing: startReadExport(bad, "bad.csv") })).rejects.toThrow(/bad\.csv: line 6/);
    expect(await countIngestRows(db)).toEqual(before);
  });

  it("subtracts a blank channel at equal times and records it", async () => {
    const text = "Time (s),Sample (A),Blank (A)\n0,1.05,0.05\n10,0.95,0.05\n20,0.86,0.06\n";
    const r = await ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: new TextEncoder().encode(text), fileName: "blank.csv", mapping: { blank: "Blank (A)", run: {} } });
    expect(r.series.map((s) => s.name)).toEqual(["Sample (A)"]);
    const { y } = await readSeries(db, analyst.labId, r.run_id, r.series[0]!.id);
    expect(Array.from(y).map((v) => +v.toFixed(12))).toEqual([1, 0.9, 0.8]);
  });

  it("a write that fails half-way leaves every table as it was", async () => {
    const before = await countIngestRows(db);
    const undo = await failInserts(db, "series", "disk full (simulated)");
    try {
      await expect(
        ingestExport(db, { labId: analyst.labId, userId: analyst.userId, bytes: new Uint8Array(fs.readFileSync(`${FIX}/cv-iso.csv`)), fileName: "cv-iso.csv" }),
      ).rejects.toThrow(/disk full/);
    } finally {
      await undo();
    }
    expect(await countIngestRows(db)).toEqual(before);
  });

  it("raw files cannot be changed or removed", async () => {
    await expect(db("raw_files").update({ name: "renamed.csv" })).rejects.toThrow(/immutable/);
    await expect(db("raw_files").delete()).rejects.toThrow(/immutable/);
  });
});

describe("refused input over HTTP: a clear message, the line, a 4xx, nothing written", () => {
  const cases: Array<[string, number, RegExp, number | undefined]> = [
    ["bad-empty.csv", 422, /The file is empty/, undefined],
    ["bad-binary.bin", 422, /binary, not a text export/, undefined],
    ["bad-header-only.csv", 422, /a header row but no data rows/, 2],
    ["bad-half-number.csv", 422, /"A" holds "0\.5x26", which is not a number/, 4],
    ["bad-backwards.csv", 422, /the time goes backwards/, 5],
    ["bad-ragged.csv", 422, /the row has 2 cells but the header has 3/, 4],
    ["bad-one-column.csv", 422, /only one column/, 2],
    ["bad-declared-encoding.csv", 422, /declares its encoding as "UTF-16"/, 1],
    ["bad-metadata-only.txt", 422, /metadata but no table of numbers/, undefined],
    ["bad-channel-no-numbers.csv", 422, /the channel "B" has no numbers at all/, 1],
  ];
  for (const route of ["uploads", "runs"] as const) {
    for (const [file, status, message, line] of cases) {
      it(`POST /api/${route} ${file} -> ${status}${line ? `, line ${line}` : ""}`, async () => {
        const before = await countIngestRows(db);
        const r = await post(route, form(`${FIX}/${file}`));
        expect(r.status).toBe(status);
        expect(r.body.error.message).toMatch(message);
        expect(r.body.error.message).toContain(file);
        expect(r.body.error.line).toBe(line);
        expect(await countIngestRows(db)).toEqual(before);
      });
    }
  }

  it("a file over the size limit is refused with 413 before it is parsed", async () => {
    const before = await countIngestRows(db);
    const big = new Uint8Array(INGEST_LIMITS.maxBytes + 1).fill(0x31);
    const r = await post("runs", form({ name: "huge.csv", bytes: big }));
    expect(r.status).toBe(413);
    expect(r.body.error.message).toMatch(/huge\.csv is 50\.0 MB; the limit is 50 MB/);
    expect(await countIngestRows(db)).toEqual(before);
  });

  it("a request without a file, a bad mapping and a file that differs from the preview are refused", async () => {
    const noFile = await post("runs", new FormData());
    expect(noFile.status).toBe(400);
    const badJson = await post("runs", form(`${FIX}/cv-iso.csv`, { mapping: "{" }));
    expect(badJson.status).toBe(400);
    const badMapping = await post("runs", form(`${FIX}/cv-iso.csv`, { mapping: JSON.stringify({ dilutionFactor: -2 }) }));
    expect(badMapping.status).toBe(422);
    expect(badMapping.body.error.issues[0].path).toBe("dilutionFactor");
    const other = await post("runs", form(`${FIX}/cv-iso.csv`, { sha256: "0".repeat(64) }));
    expect(other.status).toBe(409);
    expect(other.body.error.message).toMatch(/not the file that was previewed/);
  });

  it("a reviewer may read runs but not upload", async () => {
    session.current = await signInAs(db, "reviewer");
    const r = await post("uploads", form(`${FIX}/cv-iso.csv`));
    expect(r.status).toBe(403);
  });
});

describe("mapping the quantity", () => {
  it("the analyst may say what a channel holds; the change is recorded with the series", async () => {
    const text = "Time (min),Reading\n0,12.0\n1,10.1\n2,8.6\n";
    const r = await ingestExport(db, {
      labId: analyst.labId,
      userId: analyst.userId,
      bytes: new TextEncoder().encode(text),
      fileName: "conc.csv",
      mapping: { channels: [{ source: "Reading", include: true, quantity: "concentration", unit: "µmol/L" }], run: {} },
    });
    const { row } = await readSeries(db, analyst.labId, r.run_id, r.series[0]!.id);
    expect(row).toMatchObject({ quantity: "concentration", unit: "µmol/L" });
    expect(JSON.parse(row.processing)).toMatchObject({ quantity_set_by_analyst: { read_as: "absorbance", set_to: "concentration" } });
  });
});
