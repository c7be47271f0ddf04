// Builds the app once and prepares a template database with the demo lab; each test file then serves the build on a
// database of its own, copied from the template (tests/browser/per-file-server.ts), so files pass alone and in any
// order.
import { spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { openDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { findLabBySlug } from "@/db/queries/labs";
import { insertMembership, insertUser } from "@/db/queries/users";
import { DEMO_LAB, seedDemoWhenEmpty } from "@/db/seeds/demo";
import { hashPassword } from "@/lib/auth/password";

export const LOCKOUT_USER = { email: "lockout.probe@larkspur.example", password: "probe-pass-1234" };

declare module "vitest" {
  export interface ProvidedContext {
    templateDb: string;
    auditKey: string;
    lockoutUser: { email: string; password: string };
    artifacts: string;
  }
}

let dir: string | undefined;

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
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "halflight-e2e-"));
  const dbFile = path.join(dir, "template.sqlite");
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

  const artifacts = path.resolve("tests/.artifacts");
  fs.mkdirSync(artifacts, { recursive: true });
  project.provide("templateDb", dbFile);
  project.provide("auditKey", process.env.AUDIT_KEY);
  project.provide("lockoutUser", LOCKOUT_USER);
  project.provide("artifacts", artifacts);
}

export async function teardown(): Promise<void> {
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
}
