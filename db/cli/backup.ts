// `npm run db:backup -- FILE`: a consistent copy of the SQLite database while the server runs (SQLite's online backup
// API through better-sqlite3), then the copy's integrity check. PostgreSQL is backed up with its own tools (pg_dump).
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { configuredDatabase } from "../config";

async function main() {
  const target = process.argv[2];
  if (!target) throw new Error("Usage: npm run db:backup -- FILE (a new file for the copy).");
  const c = configuredDatabase();
  if (c.kind !== "sqlite") throw new Error("DATABASE_URL points at PostgreSQL: back it up with pg_dump (see README, Run it for a real lab).");
  if (fs.existsSync(target)) throw new Error(`${target} exists already; name a new file.`);
  const source = new Database(c.where, { readonly: true, fileMustExist: true });
  try {
    await source.backup(path.resolve(target));
  } finally {
    source.close();
  }
  const copy = new Database(target, { readonly: true });
  try {
    const check = copy.pragma("integrity_check", { simple: true });
    if (check !== "ok") throw new Error(`The copy did not pass SQLite's integrity check: ${String(check)}`);
    const rows = copy.prepare("SELECT COUNT(*) AS n FROM audit_events").get() as { n: number };
    console.log(`Backed up ${c.where} to ${path.resolve(target)} (integrity check ok; ${rows.n} audit events).`);
  } finally {
    copy.close();
  }
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
