// Each browser test file gets its own server on its own database (a copy of the template the global set-up seeded),
// its own mail sink and its own log, started before the file is read and stopped after it: no file sees another's
// changes, so each passes alone and in any order. The file reads the addresses through `inject` from ./env.
import { spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, inject } from "vitest";
import { startMailSink } from "@/lib/mail/sink";
import type { BrowserEnv } from "./env";
import { freePort } from "../helpers/free-port";

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-e2e-file-"));
const dbFile = path.join(dir, "e2e.sqlite");
fs.copyFileSync(inject("templateDb"), dbFile);
const mailDir = path.join(dir, "mail");
const sink = await startMailSink(mailDir);
const port = await freePort();
const baseURL = `http://127.0.0.1:${port}`;
const server = spawn(process.execPath, [path.resolve("node_modules/next/dist/bin/next"), "start", "-p", String(port), "-H", "127.0.0.1"], {
  stdio: ["ignore", "pipe", "pipe"],
  env: {
    ...process.env,
    DATABASE_FILE: dbFile,
    NEXTAUTH_URL: baseURL,
    NEXTAUTH_SECRET: randomBytes(24).toString("base64url"),
    AUDIT_KEY: inject("auditKey"),
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
server.stdout!.on("data", (b: Buffer) => log.write(b));
server.stderr!.on("data", (b: Buffer) => (process.stderr.write(b), log.write(b)));

const until = Date.now() + 60_000;
for (;;) {
  if (server.exitCode !== null) throw new Error(`the server exited with ${server.exitCode} before answering`);
  try {
    if ((await fetch(`${baseURL}/sign-in`, { redirect: "manual" })).status < 500) break;
  } catch {
    // not up yet
  }
  if (Date.now() > until) throw new Error(`the server did not answer ${baseURL}/sign-in within 60 s`);
  await new Promise((r) => setTimeout(r, 200));
}

(globalThis as unknown as { __halflightE2E: BrowserEnv }).__halflightE2E = {
  baseURL,
  mailDir,
  serverLog,
  dbFile,
  artifacts: inject("artifacts"),
  lockoutUser: inject("lockoutUser"),
};

afterAll(async () => {
  server.kill("SIGTERM");
  await new Promise((r) => server.once("exit", r));
  await sink.close();
  log.end();
  fs.rmSync(dir, { recursive: true, force: true });
});
