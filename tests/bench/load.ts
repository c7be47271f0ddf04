// The server under load, over HTTP, on the production build (`npm run build` first): a signed-in user's /api/me
// latency while two clients read a stored 1,000,000-point series in full (binary) again and again and a third saves a
// fit of it (fitted on the server's worker pool), beside the same probe on the idle server in the same run.
// Target (issue: big runs): /api/me p99 under 300 ms under that load.
import { spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { openDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { insertRawFile, insertRun, insertSeries, packF64 } from "@/db/queries/runs";
import { DEMO_USERS, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { freePort } from "../helpers/free-port";

const N = 1_000_000;
const LOAD_SECONDS = 20;

/** next-auth's credentials sign-in over HTTP; returns the Cookie header of the session. */
export async function signIn(base: string, email: string, password: string): Promise<string> {
  const jar = new Map<string, string>();
  const keep = (r: Response) => {
    for (const c of r.headers.getSetCookie()) {
      const [kv] = c.split(";");
      const i = kv!.indexOf("=");
      jar.set(kv!.slice(0, i), kv!.slice(i + 1));
    }
  };
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  const csrf = await fetch(`${base}/api/auth/csrf`);
  keep(csrf);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const r = await fetch(`${base}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: cookie() },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  keep(r);
  if (![...jar.keys()].some((k) => k.includes("session-token"))) throw new Error(`sign-in as ${email} failed (${r.status})`);
  return cookie();
}

const pct = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))]!;
};

async function probe(base: string, cookie: string, seconds: number): Promise<number[]> {
  const out: number[] = [];
  const until = performance.now() + seconds * 1000;
  while (performance.now() < until) {
    const t0 = performance.now();
    const r = await fetch(`${base}/api/me`, { headers: { cookie } });
    await r.arrayBuffer();
    if (r.status !== 200) throw new Error(`/api/me answered ${r.status}`);
    out.push(performance.now() - t0);
    await new Promise((res) => setTimeout(res, 25));
  }
  return out;
}

/** A production server on a fresh database with the demo lab and one stored run per size (a smooth first-order decay). */
export async function benchServer(sizes: number[]): Promise<{ base: string; series: Array<{ runId: number; seriesId: number; n: number }>; stop: () => Promise<void> } | null> {
  if (!fs.existsSync(".next/BUILD_ID") || !fs.existsSync("dist/serve.mjs")) return null;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-server-bench-"));
  const dbFile = path.join(dir, "bench.sqlite");
  const db = openDb(dbFile);
  await migrateToLatest(db);
  await seedDemoWhenEmpty(db);
  const labId = (await db("labs").first("id"))!.id as number;
  const series: Array<{ runId: number; seriesId: number; n: number }> = [];
  for (const [k, n] of sizes.entries()) {
    const t = Float64Array.from({ length: n }, (_, i) => (i * 100_000) / n);
    const y = Float64Array.from({ length: n }, (_, i) => 0.05 + 0.9 * Math.exp(-t[i]! / 30_000) + 2e-3 * Math.sin(i * 1.7));
    const at = new Date().toISOString();
    const raw = await insertRawFile(db, { lab_id: labId, sha256: String(k + 1).repeat(64), name: `bench-${n}.csv`, size: 1, bytes: Buffer.from("x"), stored_in: "database", uploaded_by: null, uploaded_at: at });
    const runId = await insertRun(db, { lab_id: labId, raw_file_id: raw, name: `bench ${n.toLocaleString("en")} points`, parser: "delimited", study: null, wavelength_nm: 590, path_length_cm: 1, temperature_c: 25, cell: null, operator: null, sample: null, method: null, method_record_id: null, dilution_factor: null, metadata: "{}", warnings: "[]", created_by: null, created_at: at });
    const seriesId = await insertSeries(db, { lab_id: labId, run_id: runId, position: 0, name: "A", source_column: "A", quantity: "absorbance", unit: "AU", point_count: n, t_f64: packF64(t), y_f64: packF64(y), t_min: 0, t_max: t[n - 1]!, skipped_lines: "[]", processing: "{}" });
    series.push({ runId, seriesId, n });
  }
  await db.destroy();

  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = spawn(process.execPath, ["dist/serve.mjs"], {
    stdio: ["ignore", "ignore", "pipe"],
    env: { ...process.env, PORT: String(port), DATABASE_FILE: dbFile, NEXTAUTH_URL: base, NEXTAUTH_SECRET: randomBytes(24).toString("base64url"), AUDIT_KEY: randomBytes(24).toString("base64url"), MAIL_TRANSPORT: "log", NODE_ENV: "production", RATE_LIMITS: "signInByAddress=1000" },
  });
  let err = "";
  server.stderr!.on("data", (b: Buffer) => (err += b.toString()));
  const stop = async () => {
    server.kill("SIGTERM");
    if (server.exitCode === null) await new Promise((r) => server.once("exit", r));
    fs.rmSync(dir, { recursive: true, force: true });
  };
  const until = Date.now() + 60_000;
  for (;;) {
    if (server.exitCode !== null) {
      await stop();
      throw new Error(`the server exited: ${err.slice(-400)}`);
    }
    try {
      if ((await fetch(`${base}/api/health`)).status < 500) break;
    } catch {
      /* not up yet */
    }
    if (Date.now() > until) {
      await stop();
      throw new Error("the server did not start within 60 s");
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return { base, series, stop };
}

export async function benchLoad(): Promise<void> {
  console.log(`\nServer under load over HTTP (production build, SQLite): /api/me while a ${N.toLocaleString("en")}-point series is read and a fit of it saved`);
  const srv = await benchServer([N]);
  if (!srv) {
    console.log("  not measured: no production build here (run npm run build first)");
    return;
  }
  const { base } = srv;
  const { runId, seriesId } = srv.series[0]!;
  try {
    const analyst = DEMO_USERS.find((u) => u.role === "analyst")!;
    const cookie = await signIn(base, analyst.email, analyst.password);

    await probe(base, cookie, 2); // warm the routes
    const idle = await probe(base, cookie, 5);

    let stop = false;
    const counts = { reads: 0, readMs: [] as number[], fits: 0, fitMs: [] as number[], failures: 0 };
    const reader = async () => {
      while (!stop) {
        const t0 = performance.now();
        const r = await fetch(`${base}/api/runs/${runId}/series/${seriesId}/points`, { headers: { cookie } });
        const b = await r.arrayBuffer();
        if (r.status !== 200 || b.byteLength < N * 16) counts.failures++;
        else counts.reads++;
        counts.readMs.push(performance.now() - t0);
      }
    };
    let version = 0;
    const saver = async () => {
      while (!stop) {
        const t0 = performance.now();
        // Each save changes the window a little, so each is a new version fitted on the server.
        version++;
        const r = await fetch(`${base}/api/fits`, {
          method: "POST",
          headers: { cookie, "content-type": "application/json", origin: base },
          body: JSON.stringify({ runId, seriesId, title: `load ${version}`, options: { models: ["linearized", "first-order"], window: { from: version, to: null } } }),
        });
        await r.arrayBuffer();
        if (r.status >= 300) {
          counts.failures++;
          if (counts.failures === 1) console.log(`  (a save answered ${r.status})`);
        } else counts.fits++;
        counts.fitMs.push(performance.now() - t0);
      }
    };
    const load = [reader(), reader(), saver()];
    const busy = await probe(base, cookie, LOAD_SECONDS);
    stop = true;
    await Promise.all(load);

    const row = (label: string, xs: number[]) => console.log(`  ${label.padEnd(44)} n ${String(xs.length).padStart(4)}  p50 ${pct(xs, 50).toFixed(0).padStart(5)} ms  p99 ${pct(xs, 99).toFixed(0).padStart(5)} ms  max ${Math.max(...xs).toFixed(0).padStart(5)} ms`);
    row("/api/me, idle server", idle);
    row(`/api/me, under load (${LOAD_SECONDS} s)`, busy);
    row("full binary read of the 1M series (2 clients)", counts.readMs);
    row("fit of the 1M series saved (1 client)", counts.fitMs);
    console.log(`  ${counts.reads} full reads (${((counts.reads * N * 16) / 1e6).toFixed(0)} MB), ${counts.fits} saved fits, ${counts.failures} failures; target /api/me p99 under load < 300 ms: ${pct(busy, 99) < 300 ? "met" : "NOT met"}`);
  } finally {
    await srv.stop();
  }
}
