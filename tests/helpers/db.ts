// A fresh, migrated in-memory database for each test.
import type { Knex } from "knex";
import { openDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";

export async function freshDb(): Promise<Knex> {
  const db = openDb(":memory:");
  await migrateToLatest(db);
  return db;
}
