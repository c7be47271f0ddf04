// The session-signing secret: NEXTAUTH_SECRET. Only the demo and development may do without it: then one is generated
// once into HALFLIGHT_KEY_DIR (default ~/.halflight), never beside the database, so a copy of the data carries no key.
// A production start without it is a clear error, never a silently generated secret.
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

let cached: string | undefined;

/** The demo (`npm run demo` sets HALFLIGHT_DEMO=1), development and tests may generate their keys. */
export function keysMayBeGenerated(): boolean {
  return process.env.HALFLIGHT_DEMO === "1" || process.env.NODE_ENV !== "production";
}

/** A key generated once into HALFLIGHT_KEY_DIR (default ~/.halflight) and read from there afterwards; when two
 * processes generate it at once, the first file written wins and both read it. */
export function generatedKey(fileName: string): string {
  const dir = process.env.HALFLIGHT_KEY_DIR ?? path.join(os.homedir(), ".halflight");
  const file = path.join(dir, fileName);
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  try {
    fs.writeFileSync(file, randomBytes(32).toString("base64url"), { mode: 0o600, flag: "wx" });
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
  }
  return fs.readFileSync(file, "utf8").trim();
}

export function authSecret(): string {
  if (process.env.NEXTAUTH_SECRET) return process.env.NEXTAUTH_SECRET;
  if (cached) return cached;
  // `next build` loads the route modules to collect page data; nothing is signed then, and nothing may be written.
  if (process.env.NEXT_PHASE === "phase-production-build") return "build-time: never used to sign a session";
  if (!keysMayBeGenerated())
    throw new Error("NEXTAUTH_SECRET is not set. Set it to a long random value (for example: openssl rand -base64 32) before starting Halflight.");
  cached = generatedKey("session.key");
  return cached;
}
