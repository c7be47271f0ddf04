// One-time tokens for the first-run page of a new install (no lab yet): only the SHA-256 is kept; the token itself is
// printed once on the server's console, so only someone who can read that console can claim the install.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("setup_tokens", (t) => {
    t.increments("id").primary();
    t.string("token_sha256", 64).notNullable().unique();
    t.string("created_at").notNullable();
    t.string("expires_at").notNullable();
    t.string("used_at");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("setup_tokens");
}
