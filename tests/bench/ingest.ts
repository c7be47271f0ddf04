// Ingest benchmark: end-to-end ingest of a generated 1,000,000-point two-column CSV and of a 100,000-row x 8-channel
// file, beside (a) the floor, a byte-level scan plus one packed BLOB per column, and (b) pandas.read_csv of the same file;
// each in a fresh process for its own peak RSS. Also `cli ingest`, and reading a stored 1M-point series back.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { DEBIAN_PYTHON } from "../helpers/python";
import { seededRandom } from "../helpers/random";

function write(file: string, rows: number, channels: number) {
  const rnd = seededRandom(rows + channels);
  const out: string[] = [["Time (s)", ...Array.from({ length: channels }, (_, c) => `Cell ${c + 1} (A)`)].join(",")];
  for (let i = 0; i < rows; i++) {
    const t = i * 0.05;
    const cells = [t.toFixed(2)];
    for (let c = 0; c < channels; c++) cells.push((0.05 + 0.9 * Math.exp(-(2e-4 + c * 1e-5) * t) + 0.002 * rnd.normal()).toFixed(6));
    out.push(cells.join(","));
  }
  fs.writeFileSync(file, out.join("\n") + "\n");
}

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env) {
  const t0 = performance.now();
  const r = spawnSync(cmd, args, { encoding: "utf8", env, maxBuffer: 1 << 26 });
  const wall = (performance.now() - t0) / 1000;
  if (r.status !== 0) return { ok: false as const, wall, err: (r.stderr || r.error?.message || "").trim().split("\n").slice(-3).join(" ") };
  const lines = r.stdout.trim().split("\n");
  let json: Record<string, number> = {};
  try {
    json = JSON.parse(lines[lines.length - 1]!);
  } catch {
    /* cli prints pretty JSON */
    try {
      json = JSON.parse(r.stdout);
    } catch {
      json = {};
    }
  }
  return { ok: true as const, wall, json };
}

export function benchIngest(): void {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-ingest-bench-"));
  const tsx = path.resolve("node_modules/.bin/tsx");
  const cases = [
    { label: "1,000,000 points, 2 columns", file: path.join(dir, "two-col.csv"), rows: 1_000_000, channels: 1 },
    { label: "100,000 rows x 8 channels", file: path.join(dir, "eight.csv"), rows: 100_000, channels: 8 },
  ];
  console.log("\nIngest end to end (fresh process each; seconds are the work inside the process, RSS its peak)");
  for (const c of cases) {
    write(c.file, c.rows, c.channels);
    const mb = fs.statSync(c.file).size / 1e6;
    const ours = run(tsx, ["tests/bench/ingest-one.ts", "ours", c.file, path.join(dir, `ours-${c.channels}.sqlite`)]);
    const parse = run(tsx, ["tests/bench/ingest-one.ts", "parse", c.file]);
    const floor = run(tsx, ["tests/bench/ingest-one.ts", "floor", c.file, path.join(dir, `floor-${c.channels}.sqlite`)]);
    const pandas = run(DEBIAN_PYTHON, ["tests/bench/pandas_read.py", c.file]);
    const cliDb = path.join(dir, `cli-${c.channels}.sqlite`);
    const cli = run("npm", ["run", "--silent", "cli", "--", "ingest", c.file, "--json"], { ...process.env, DATABASE_FILE: cliDb });
    // Whole process, median of three each: the command as launched (node lib/cli/launch.mjs, without npm's own start)
    // beside the pandas + SQLite peer.
    const wholeOurs = [0, 1, 2].map((k) => run(process.execPath, ["lib/cli/launch.mjs", "ingest", c.file, "--json"], { ...process.env, DATABASE_FILE: path.join(dir, `whole-${c.channels}-${k}.sqlite`) }));
    const wholePeer = [0, 1, 2].map((k) => run(DEBIAN_PYTHON, ["tests/bench/pandas_sqlite_ingest.py", c.file, path.join(dir, `peer-${c.channels}-${k}.sqlite`)]));
    const oursS = ours.ok ? ours.json.seconds_ingest! : NaN;
    const points = c.rows * c.channels;
    const dbBytes = fs.existsSync(path.join(dir, `ours-${c.channels}.sqlite`)) ? fs.statSync(path.join(dir, `ours-${c.channels}.sqlite`)).size : NaN;
    console.log(`\n  ${c.label} (${mb.toFixed(1)} MB)`);
    if (!ours.ok) console.log(`    Halflight ingest FAILED: ${ours.err}`);
    else {
      const own = ours.json.max_rss_mb! - ours.json.rss_before_mb!;
      console.log(`    Halflight ingestExport (parse, hash, store, commit): ${oursS.toFixed(2)} s  ${(mb / oursS).toFixed(1)} MB/s; memory: peak RSS ${ours.json.max_rss_mb!.toFixed(0)} MB, ${own.toFixed(0)} MB over the running process before the file (${(own / mb).toFixed(1)}x the file; target under 3x: ${own / mb < 3 ? "met" : "NOT met"})`);
    }
    if (floor.ok) console.log(`    floor (byte scan + BLOB): ${floor.json.seconds!.toFixed(2)} s   ratio ours/floor ${(oursS / floor.json.seconds!).toFixed(2)}`);
    if (pandas.ok) {
      const own = pandas.json.max_rss_mb! - pandas.json.rss_before_mb!;
      console.log(`    pandas.read_csv alone (parses, stores nothing): ${pandas.json.seconds!.toFixed(2)} s; ${own.toFixed(0)} MB over the process before it (${(own / mb).toFixed(1)}x the file), peak RSS ${pandas.json.max_rss_mb!.toFixed(0)} MB`);
      if (parse.ok) console.log(`    the same work in ours, the parse alone (file to Float64Arrays on a worker thread): ${parse.json.seconds_parse!.toFixed(2)} s; ratio to pandas.read_csv ${(parse.json.seconds_parse! / pandas.json.seconds!).toFixed(2)} (target 1.0: ${parse.json.seconds_parse! <= pandas.json.seconds! ? "met" : "NOT met"})`);
      console.log(`    whole ingest against pandas.read_csv alone: ratio ${(oursS / pandas.json.seconds!).toFixed(2)} (target 1.0: ${oursS <= pandas.json.seconds! ? "met" : "NOT met"}; the SQLite write of raw file and series is most of the difference: see the floor)`);
    } else console.log(`    pandas peer unavailable: ${pandas.err} (install Debian's python3-pandas)`);
    console.log(`    npm run cli -- ingest (wall clock, npm's own start included): ${cli.ok ? cli.wall.toFixed(2) + " s" : "FAILED " + cli.err}`);
    const med = (xs: number[]) => [...xs].sort((a, b) => a - b)[1]!;
    if (wholeOurs.every((r) => r.ok) && wholePeer.every((r) => r.ok)) {
      const o = med(wholeOurs.map((r) => r.wall)),
        p = med(wholePeer.map((r) => r.wall));
      console.log(`    whole process, median of 3: node lib/cli/launch.mjs ingest ${o.toFixed(2)} s; python3 pandas.read_csv + SQLite BLOBs ${p.toFixed(2)} s; ratio ${(o / p).toFixed(2)} (target 1.0: ${o <= p ? "met" : "NOT met"})`);
    } else console.log(`    whole-process comparison unavailable: ${[...wholeOurs, ...wholePeer].find((r) => !r.ok)?.err}`);
    const rawPerPoint = fs.statSync(c.file).size / points;
    console.log(`    stored per point: ${(dbBytes / points - rawPerPoint).toFixed(1)} bytes of series (t and y as float64) + ${rawPerPoint.toFixed(1)} of the kept raw file (database file ${(dbBytes / 1e6).toFixed(1)} MB)`);
  }
  const read = run(tsx, ["tests/bench/ingest-one.ts", "read", path.join(dir, "ours-1.sqlite")]);
  if (read.ok) console.log(`\n  Reading one stored 1M-point series back into typed arrays: ${(read.json.seconds_read! * 1000).toFixed(0)} ms`);
  fs.rmSync(dir, { recursive: true, force: true });
}
