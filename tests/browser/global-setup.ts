// Builds the app, prepares a throw-away database with the demo lab, serves the production build on a free port,
// and hands the address to the browser tests.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { openDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { findLabBySlug } from "@/db/queries/labs";
import { insertMembership, insertUser } from "@/db/queries/users";
import { DEMO_LAB, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { hashPassword } from "@/lib/auth/password";
import { startMailSink } from "@/lib/mail/sink";

export const LOCKOUT_USER = { email: "lockout.probe@larkspur.example", password: "probe-pass-1234" };

declare module "vitest" {
  export interface ProvidedContext {
    baseURL: string;
    lockoutUser: { email: string; password: string };
    artifacts: string;
    mailDir: string;
    serverLog: string;
    dbFile: string;
  }
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.listen(0, "127.0.0.1", () => {
      const a = s.address();
      s.close(() => (a && typeof a === "object" ? resolve(a.port) : reject(new Error("no port"))));
    });
  });
}

async function waitForServer(url: string, child: ChildProcess, ms: number): Promise<void> {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode} before answering`);
    try {
      const r = await fetch(url, { redirect: "manual" });
      if (r.status < 500) return;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`the server did not answer ${url} within ${ms} ms`);
}

let server: ChildProcess | undefined;
let sink: Awaited<ReturnType<typeof startMailSink>> | undefined;

export async function setup(project: TestProject): Promise<void> {
  if (process.env.HALFLIGHT_SKIP_BUILD !== "1") {
    const b = spawnSync(process.execPath, [path.resolve("node_modules/next/dist/bin/next"), "build"], {
      stdio: "inherit",
      env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
    });
    if (b.status !== 0) throw new Error("next build failed");
    // The start script npm start runs (dist/serve.mjs), for the tests that start the server as an installation does.
    const sv = spawnSync("npm", ["run", "--silent", "build:server"], { stdio: "inherit" });
    if (sv.status !== 0) throw new Error("npm run build:server failed");
  }
  // One audit key for the seeding here and the server: rows written now must verify there.
  process.env.AUDIT_KEY ??= randomBytes(32).toString("base64url");
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-e2e-"));
  const dbFile = path.join(dir, "e2e.sqlite");
  const db = openDb(dbFile);
  await migrateToLatest(db);
  await seedDemoWhenEmpty(db, new Date(), { runs: true });
  const lab = await findLabBySlug(db, DEMO_LAB.slug);
  const now = new Date().toISOString();
  const u = await insertUser(db, {
    email: LOCKOUT_USER.email,
    displayName: "Lockout Probe",
    passwordHash: await hashPassword(LOCKOUT_USER.password),
    createdAt: now,
  });
  await insertMembership(db, { userId: u.id, labId: lab!.id, role: "analyst", createdAt: now });
  await db.destroy();

  const mailDir = path.join(dir, "mail");
  sink = await startMailSink(mailDir);
  const port = await freePort();
  const baseURL = `http://127.0.0.1:${port}`;
  server = spawn(process.execPath, [path.resolve("node_modules/next/dist/bin/next"), "start", "-p", String(port), "-H", "127.0.0.1"], {
    stdio: ["ignore", "pipe", "pipe"],
    env: {
      ...process.env,
      DATABASE_FILE: dbFile,
      NEXTAUTH_URL: baseURL,
      NEXTAUTH_SECRET: randomBytes(24).toString("base64url"),
      AUDIT_KEY: process.env.AUDIT_KEY,
      NEXT_TELEMETRY_DISABLED: "1",
      SMTP_URL: `smtp://127.0.0.1:${sink.port}`,
      MAIL_SINK_DIR: mailDir,
      // Every browser test signs in from 127.0.0.1: the per-address sign-in count is raised as a NAT'ed lab would
      // (the limits themselves are tested in tests/unit/rate-limit.test.ts).
      RATE_LIMITS: "signInByAddress=1000,shareByAddress=1000",
    },
  });
  // The server's output goes to the console and to a file, so a test can read what the server logged.
  const serverLog = path.join(dir, "server.log");
  const log = fs.createWriteStream(serverLog);
  server.stdout!.on("data", (b: Buffer) => (process.stdout.write(b), log.write(b)));
  server.stderr!.on("data", (b: Buffer) => (process.stderr.write(b), log.write(b)));
  await waitForServer(`${baseURL}/sign-in`, server, 60_000);

  const artifacts = path.resolve("tests/.artifacts");
  fs.mkdirSync(artifacts, { recursive: true });
  project.provide("baseURL", baseURL);
  project.provide("lockoutUser", LOCKOUT_USER);
  project.provide("artifacts", artifacts);
  project.provide("mailDir", mailDir);
  project.provide("serverLog", serverLog);
  project.provide("dbFile", dbFile);
}

export async function teardown(): Promise<void> {
  server?.kill("SIGTERM");
  await sink?.close();
}
