// Temperature studies (and excess-concentration series): versioned like fits; each change saves a new row.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("studies", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.integer("record_id").nullable();
    t.integer("version").notNullable();
    t.integer("previous_id").nullable().references("studies.id").onDelete("RESTRICT");
    t.string("name", 200).notNullable();
    t.string("kind", 16).notNullable(); // "temperature" | "excess"
    t.text("members").notNullable(); // JSON
    t.text("options").notNullable(); // JSON
    t.text("results").notNullable(); // JSON
    t.string("engine_version", 64).notNullable();
    t.string("content_hash", 64).notNullable();
    t.text("reason").nullable();
    t.integer("author_id").nullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
    t.index(["lab_id", "record_id", "version"]);
  });
  if (String(knex.client.config.client).includes("sqlite")) {
    await knex.raw(`CREATE TRIGGER studies_immutable BEFORE UPDATE ON studies WHEN NOT (OLD.record_id IS NULL AND NEW.record_id = OLD.id AND
      NEW.members = OLD.members AND NEW.results = OLD.results AND NEW.content_hash = OLD.content_hash)
      BEGIN SELECT RAISE(ABORT, 'study versions are immutable'); END`);
    await knex.raw(`CREATE TRIGGER studies_no_delete BEFORE DELETE ON studies BEGIN SELECT RAISE(ABORT, 'study versions are immutable'); END`);
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("studies");
}
