// Stored validation runs of the engine (installation/operational qualification), signed like records.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("validation_runs", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.text("report").notNullable(); // JSON
    t.boolean("all_passed").notNullable();
    t.integer("passed").notNullable();
    t.integer("failed").notNullable();
    t.string("engine_version", 64).notNullable();
    t.string("content_hash", 64).notNullable();
    t.integer("run_by").notNullable().references("users.id").onDelete("RESTRICT");
    t.string("run_at", 32).notNullable();
  });
  if (String(knex.client.config.client).includes("sqlite")) {
    await knex.raw(`CREATE TRIGGER validation_runs_no_update BEFORE UPDATE ON validation_runs BEGIN SELECT RAISE(ABORT, 'validation runs are immutable'); END`);
    await knex.raw(`CREATE TRIGGER validation_runs_no_delete BEFORE DELETE ON validation_runs BEGIN SELECT RAISE(ABORT, 'validation runs are immutable'); END`);
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("validation_runs");
}
