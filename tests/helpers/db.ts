// A fresh, migrated in-memory database for each test, and the demo users signed in on it.
import type { Knex } from "knex";
import { openDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { DEMO_USERS } from "@/db/seeds/demo";
import { signInWithPassword, type SignedInUser } from "@/lib/auth/sign-in";
import type { Role } from "@/lib/permissions/roles";

export async function freshDb(): Promise<Knex> {
  const db = openDb(":memory:");
  await migrateToLatest(db);
  return db;
}

/** Signs in the seeded demo user who holds the role (through the real sign-in, as the app does). */
export async function signInAs(db: Knex, role: Role): Promise<SignedInUser> {
  const u = DEMO_USERS.find((x) => x.role === role)!;
  return signInWithPassword(db, u.email, u.password);
}
