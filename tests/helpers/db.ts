// A fresh, migrated database for each test file: in-memory SQLite, or, when DATABASE_URL is set (npm run test:pg), a new
// database of its own on the PostgreSQL test cluster. And the demo users signed in on it.
import { randomBytes } from "node:crypto";
import knex, { type Knex } from "knex";
import { openDb } from "@/db";
import { postgresConfig } from "@/db/config";
import { migrateToLatest } from "@/db/migrate";
import { DEMO_USERS } from "@/db/seeds/demo";
import { signInWithPassword, type SignedInUser } from "@/lib/auth/sign-in";
import type { Role } from "@/lib/permissions/roles";

export const onPostgres = Boolean(process.env.DATABASE_URL);

/** A new, empty database on the PostgreSQL test cluster: its address. */
async function newPostgresDatabase(): Promise<string> {
  const url = new URL(process.env.DATABASE_URL!);
  const name = `t_${process.pid}_${randomBytes(6).toString("hex")}`;
  const admin = knex(postgresConfig(url.toString()));
  try {
    await admin.raw(`CREATE DATABASE ${name}`);
  } finally {
    await admin.destroy();
  }
  url.pathname = `/${name}`;
  return url.toString();
}

export async function freshDb(): Promise<Knex> {
  if (!onPostgres) {
    const db = openDb(":memory:");
    await migrateToLatest(db);
    return db;
  }
  const db = knex(postgresConfig(await newPostgresDatabase()));
  await migrateToLatest(db);
  return db;
}

/** Signs in the seeded demo user who holds the role (through the real sign-in, as the app does). */
export async function signInAs(db: Knex, role: Role): Promise<SignedInUser> {
  const u = DEMO_USERS.find((x) => x.role === role)!;
  return signInWithPassword(db, u.email, u.password);
}

/**
 * Tampering as someone with direct database access would: lifts the immutability guard of a table (SQLite: drops its
 * update/delete triggers; PostgreSQL: disables the table's own triggers) so a test can show that verification still
 * finds the change.
 */
export async function liftGuards(db: Knex, table: string): Promise<void> {
  if (onPostgres) {
    await db.raw(`ALTER TABLE ${table} DISABLE TRIGGER USER`);
    return;
  }
  const triggers: Array<{ name: string }> = await db("sqlite_master").where({ type: "trigger", tbl_name: table }).select("name");
  for (const t of triggers) await db.raw(`DROP TRIGGER ${t.name}`);
}

/** Makes every insert into `table` fail with `message` (a write failing half-way); returns the undo. */
export async function failInserts(db: Knex, table: string, message: string): Promise<() => Promise<void>> {
  if (onPostgres) {
    await db.raw(`CREATE FUNCTION fail_${table}() RETURNS trigger AS $$ BEGIN RAISE EXCEPTION '${message}'; END; $$ LANGUAGE plpgsql`);
    await db.raw(`CREATE TRIGGER fail_${table} BEFORE INSERT ON ${table} FOR EACH ROW EXECUTE FUNCTION fail_${table}()`);
    return async () => void (await db.raw(`DROP FUNCTION fail_${table}() CASCADE`));
  }
  await db.raw(`CREATE TRIGGER fail_${table} BEFORE INSERT ON ${table} BEGIN SELECT RAISE(ABORT, '${message}'); END`);
  return async () => void (await db.raw(`DROP TRIGGER fail_${table}`));
}

/** An empty database (not migrated) for a spawned command: its environment and a way to open it from the test. */
export async function emptyTarget(file: string): Promise<{ env: Record<string, string>; open(): Knex }> {
  if (!onPostgres) return { env: { DATABASE_FILE: file, DATABASE_URL: "" }, open: () => openDb(file) };
  const url = await newPostgresDatabase();
  return { env: { DATABASE_URL: url }, open: () => knex(postgresConfig(url)) };
}
