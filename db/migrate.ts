// Applies migrations in code (at server start, in the CLI, in test set-up).
import type { Knex } from "knex";
import { MIGRATIONS } from "./migrations";

const source: Knex.MigrationSource<(typeof MIGRATIONS)[number]> = {
  getMigrations: async () => [...MIGRATIONS],
  getMigrationName: (m) => m.name,
  getMigration: async (m) => ({ up: m.up, down: m.down }),
};

export async function migrateToLatest(db: Knex): Promise<void> {
  await db.migrate.latest({ migrationSource: source });
}

export async function rollbackAll(db: Knex): Promise<void> {
  await db.migrate.rollback({ migrationSource: source }, true);
}
