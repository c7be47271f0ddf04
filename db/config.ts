// Knex configuration shared by the app, the CLI, the tests and knexfile.ts.
import path from "node:path";
import type { Knex } from "knex";

export const DEFAULT_DATABASE_FILE = "./data/halflight.sqlite";

/** SQLite pragmas applied to every new connection (WAL for concurrent readers, FK checks, wait instead of failing). */
export function applySqlitePragmas(conn: { pragma: (sql: string) => unknown }): void {
  conn.pragma("journal_mode = WAL");
  conn.pragma("foreign_keys = ON");
  conn.pragma("busy_timeout = 5000");
  conn.pragma("synchronous = NORMAL");
}

export function sqliteConfig(file: string): Knex.Config {
  const filename = file === ":memory:" ? ":memory:" : path.resolve(file);
  return {
    client: "better-sqlite3",
    connection: { filename },
    useNullAsDefault: true,
    // One connection: SQLite has one writer, and ":memory:" is private to its connection.
    pool: {
      min: 1,
      max: 1,
      afterCreate(conn: { pragma: (sql: string) => unknown }, done: (err: Error | null, conn: unknown) => void) {
        try {
          applySqlitePragmas(conn);
          done(null, conn);
        } catch (e) {
          done(e as Error, conn);
        }
      },
    },
  };
}
