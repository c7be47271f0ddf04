// Share links to one pinned record version (only the token's hash is stored), their views, and the outgoing mail log.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("share_links", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("token_sha256", 64).notNullable().unique();
    t.string("object_type", 16).notNullable();
    t.integer("object_id").notNullable();
    t.string("recipient", 254).nullable();
    t.string("expires_at", 32).notNullable();
    t.string("revoked_at", 32).nullable();
    t.integer("revoked_by").nullable().references("users.id").onDelete("RESTRICT");
    t.integer("created_by").notNullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
  });
  await knex.schema.createTable("share_views", (t) => {
    t.increments("id").primary();
    t.integer("share_link_id").notNullable().references("share_links.id").onDelete("RESTRICT");
    t.integer("viewer_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.string("viewed_at", 32).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("share_views");
  await knex.schema.dropTable("share_links");
}
