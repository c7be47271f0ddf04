// Rate-limit counters kept in the database, so every server process on one database shares them. The columns are the
// ones rate-limiter-flexible's SQLite and PostgreSQL stores read and write (key, points, expire in ms since epoch).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("rate_limits", (t) => {
    t.string("key", 255).primary();
    t.integer("points").notNullable().defaultTo(0);
    t.bigInteger("expire");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("rate_limits");
}
