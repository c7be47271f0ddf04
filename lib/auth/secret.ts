// The session-signing secret: NEXTAUTH_SECRET, or one generated once and kept beside the database file.
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { DEFAULT_DATABASE_FILE } from "@/db/config";

let cached: string | undefined;

export function authSecret(): string {
  if (process.env.NEXTAUTH_SECRET) return process.env.NEXTAUTH_SECRET;
  if (cached) return cached;
  const dbFile = process.env.DATABASE_FILE ?? DEFAULT_DATABASE_FILE;
  const dir = dbFile === ":memory:" ? path.resolve("data") : path.dirname(path.resolve(dbFile));
  const file = path.join(dir, ".auth-secret");
  try {
    cached = fs.readFileSync(file, "utf8").trim();
  } catch {
    fs.mkdirSync(dir, { recursive: true });
    cached = randomBytes(32).toString("base64url");
    fs.writeFileSync(file, cached, { mode: 0o600 });
  }
  return cached;
}
