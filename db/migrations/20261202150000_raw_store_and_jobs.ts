// Where a raw file's bytes live (the database row itself, or an S3-compatible object store keyed by lab and SHA-256),
// and the background jobs table: long work (validation runs) queued, claimed by one server process, with its progress.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  // Adding a column fires no row trigger: raw files stay immutable.
  await knex.schema.alterTable("raw_files", (t) => {
    t.string("stored_in", 16).notNullable().defaultTo("database");
  });
  await knex.schema.createTable("jobs", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("kind", 32).notNullable();
    t.string("state", 16).notNullable(); // queued | running | done | failed
    t.integer("progress_done").notNullable().defaultTo(0);
    t.integer("progress_total").notNullable().defaultTo(0);
    t.string("progress_note", 200).nullable();
    t.text("result").nullable(); // JSON
    t.text("error").nullable();
    t.integer("created_by").nullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
    t.string("started_at", 32).nullable();
    t.string("finished_at", 32).nullable();
    t.index(["lab_id", "created_at"]);
  });
  // One queued-or-running job of a kind per lab, kept by the database (a partial unique index, same SQL on both).
  await knex.raw(`CREATE UNIQUE INDEX jobs_one_active ON jobs (lab_id, kind) WHERE state IN ('queued', 'running')`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("jobs");
  await knex.schema.alterTable("raw_files", (t) => {
    t.dropColumn("stored_in");
  });
}
