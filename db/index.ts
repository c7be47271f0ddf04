// The database handle: one Knex instance per process, opened on DATABASE_FILE (SQLite by default).
import knex, { type Knex } from "knex";
import { configuredDatabase, sqliteConfig } from "./config";
import { migrateToLatest } from "./migrate";
import fs from "node:fs";
import path from "node:path";

export type Db = Knex | Knex.Transaction;

export function openDb(file: string): Knex {
  if (file !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  return knex(sqliteConfig(file));
}

const holder = globalThis as unknown as { __halflightDb?: Promise<Knex> };

/** The configured database (PostgreSQL when DATABASE_URL is set, else SQLite at DATABASE_FILE), not yet migrated. */
export function openConfiguredDb(): { db: Knex; where: string } {
  const c = configuredDatabase();
  if (c.kind === "sqlite") return { db: openDb(c.where), where: c.where };
  return { db: knex(c.config), where: c.where };
}

/** The process-wide database, migrated on first use. */
export function getDb(): Promise<Knex> {
  holder.__halflightDb ??= (async () => {
    const { db } = openConfiguredDb();
    await migrateToLatest(db);
    return db;
  })();
  return holder.__halflightDb;
}

/** Tests and the CLI may hand in a database of their own. */
export function setDb(db: Knex): void {
  holder.__halflightDb = Promise.resolve(db);
}
