// One measured ingest in a fresh process (so peak RSS is this work's own): prints JSON.
//   ingest-one.ts ours FILE DBFILE    parse + raw file + series + commit through lib/ingest
//   ingest-one.ts parse FILE          the parse alone, on a warmed worker thread, read from the file
//   ingest-one.ts floor FILE DBFILE   a byte-level number scan + one packed BLOB per column (the floor)
//   ingest-one.ts read DBFILE         read the first stored series back into typed arrays
import fs from "node:fs";
import Database from "better-sqlite3";
import { openDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { insertLab } from "@/db/queries/labs";
import { ingestExport } from "@/lib/ingest";
import { runJob } from "@/lib/jobs/pool";
import { readSeries } from "@/lib/runs";

/** As in a running server: the job pool's workers are up before the file arrives (a small file parsed first). */
async function warmPool(): Promise<void> {
  await runJob("parse-export", { bytes: new TextEncoder().encode("Time (s),A\n0,1\n1,0.5\n"), fileName: "warm.csv" });
}

async function main() {
  const [mode, file, dbFile] = process.argv.slice(2) as [string, string, string];
  const t0 = performance.now();
  let extra: Record<string, unknown> = {};
  if (mode === "ours") {
    const db = openDb(dbFile);
    await migrateToLatest(db);
    const lab = await insertLab(db, { slug: "bench", name: "Bench", createdAt: new Date().toISOString() });
    await warmPool();
    const rssBefore = process.memoryUsage().rss / 1048576;
    const start = performance.now();
    const r = await ingestExport(db, { labId: lab.id, userId: null, bytes: fs.readFileSync(file), fileName: "bench.csv" });
    extra = { seconds_ingest: (performance.now() - start) / 1000, rss_before_mb: rssBefore, points: r.series.reduce((s, x) => s + x.points, 0) };
    await db.destroy();
  } else if (mode === "parse") {
    // The parse alone (what pandas.read_csv does): the file read into Float64Arrays on a warmed worker thread.
    await warmPool();
    const start = performance.now();
    const bytes = fs.readFileSync(file);
    const r = await runJob("parse-export", { bytes, fileName: "bench.csv" });
    extra = { seconds_parse: (performance.now() - start) / 1000, points: r.parsed?.series.reduce((s, x) => s + x.t.length, 0) };
  } else if (mode === "floor") {
    const bytes = fs.readFileSync(file);
    // Skip the header line, then scan numbers byte by byte into per-column Float64Arrays.
    let i = bytes.indexOf(10) + 1;
    const cols: number[][] = [];
    let col = 0;
    while (i < bytes.length) {
      let j = i;
      while (j < bytes.length && bytes[j] !== 44 && bytes[j] !== 10 && bytes[j] !== 13) j++;
      (cols[col] ??= []).push(Number(bytes.toString("latin1", i, j)));
      if (bytes[j] === 44) col++;
      else {
        col = 0;
        if (bytes[j] === 13) j++;
      }
      i = j + 1;
    }
    const db = new Database(dbFile);
    db.pragma("journal_mode = WAL");
    db.exec("CREATE TABLE s (id INTEGER PRIMARY KEY, a BLOB)");
    const ins = db.prepare("INSERT INTO s (a) VALUES (?)");
    db.transaction(() => {
      for (const c of cols) ins.run(Buffer.from(Float64Array.from(c).buffer));
    })();
    db.close();
    extra = { points: cols.reduce((s, c) => s + c.length, 0) - (cols[0]?.length ?? 0) };
  } else if (mode === "read") {
    const db = openDb(file);
    const run = await db("runs").first("id", "lab_id");
    const s = await db("series").where({ run_id: run!.id }).first("id");
    const start = performance.now();
    const { t, y } = await readSeries(db, run!.lab_id, run!.id, s!.id);
    extra = { seconds_read: (performance.now() - start) / 1000, points: t.length, check: y[y.length - 1] };
    await db.destroy();
  }
  const seconds = (performance.now() - t0) / 1000;
  console.log(JSON.stringify({ mode, seconds, max_rss_mb: process.resourceUsage().maxRSS / 1024, ...extra }));
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
