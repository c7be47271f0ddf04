// Review states, electronic signatures and comments on record versions. All append-only.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("signatures", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("object_type", 16).notNullable();
    t.integer("object_id").notNullable(); // the record version signed
    t.integer("user_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.string("printed_name", 200).notNullable();
    t.string("meaning", 16).notNullable(); // authored | reviewed | approved
    t.string("content_hash", 64).notNullable();
    t.string("signed_at", 32).notNullable();
    t.index(["object_type", "object_id"]);
  });
  await knex.schema.createTable("review_events", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("object_type", 16).notNullable();
    t.integer("object_id").notNullable();
    t.string("state", 16).notNullable(); // submitted | approved | rejected | withdrawn
    t.integer("actor_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.integer("signature_id").nullable().references("signatures.id").onDelete("RESTRICT");
    t.text("reason").nullable();
    t.string("at", 32).notNullable();
    t.index(["object_type", "object_id"]);
  });
  await knex.schema.createTable("comments", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("object_type", 16).notNullable();
    t.integer("object_id").notNullable();
    t.integer("parent_id").nullable().references("comments.id").onDelete("RESTRICT");
    t.integer("author_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.text("body").notNullable();
    t.string("created_at", 32).notNullable();
    t.index(["object_type", "object_id"]);
  });
  if (String(knex.client.config.client).includes("sqlite")) {
    for (const table of ["signatures", "review_events", "comments"]) {
      await knex.raw(`CREATE TRIGGER ${table}_no_update BEFORE UPDATE ON ${table} BEGIN SELECT RAISE(ABORT, '${table} are append-only'); END`);
      await knex.raw(`CREATE TRIGGER ${table}_no_delete BEFORE DELETE ON ${table} BEGIN SELECT RAISE(ABORT, '${table} are append-only'); END`);
    }
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("comments");
  await knex.schema.dropTable("review_events");
  await knex.schema.dropTable("signatures");
}
