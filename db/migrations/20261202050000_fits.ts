// Fit records: immutable versions; a change saves a new row linked to the previous one.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("fits", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.integer("run_id").notNullable().references("runs.id").onDelete("RESTRICT");
    t.integer("series_id").notNullable().references("series.id").onDelete("RESTRICT");
    /** The id of version 1: every version of one record shares it. */
    t.integer("record_id").nullable();
    t.integer("version").notNullable();
    t.integer("previous_id").nullable().references("fits.id").onDelete("RESTRICT");
    t.string("title", 200).notNullable();
    t.string("primary_model", 48).notNullable();
    t.double("k_value").nullable();
    t.double("k_se").nullable();
    t.string("state", 16).notNullable().defaultTo("draft");
    t.text("options").notNullable(); // JSON
    t.text("results").notNullable(); // JSON
    t.string("engine_version", 64).notNullable();
    t.string("data_sha256", 64).notNullable();
    t.string("content_hash", 64).notNullable();
    t.text("reason").nullable();
    t.integer("author_id").nullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
    t.index(["lab_id", "created_at"]);
    t.index(["record_id", "version"]);
  });
  if (String(knex.client.config.client).includes("sqlite")) {
    // Versions are immutable once written; only the record id of a first version is filled in (it is its own id).
    await knex.raw(`CREATE TRIGGER fits_immutable BEFORE UPDATE ON fits WHEN NOT (OLD.record_id IS NULL AND NEW.record_id = OLD.id AND
      NEW.options = OLD.options AND NEW.results = OLD.results AND NEW.content_hash = OLD.content_hash AND NEW.state = OLD.state)
      BEGIN SELECT RAISE(ABORT, 'fit versions are immutable'); END`);
    await knex.raw(`CREATE TRIGGER fits_no_delete BEFORE DELETE ON fits BEGIN SELECT RAISE(ABORT, 'fit versions are immutable'); END`);
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("fits");
}
