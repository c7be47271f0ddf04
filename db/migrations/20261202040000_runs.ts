// Raw files (immutable, SHA-256), runs and their series (points packed as little-endian float64 BLOBs: the ingest
// benchmark measured 135–300 ms to write 1M points this way against 1.2–1.9 s for a row per point).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("raw_files", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("sha256", 64).notNullable();
    t.string("name", 255).notNullable();
    t.integer("size").notNullable();
    t.binary("bytes").notNullable();
    t.integer("uploaded_by").nullable().references("users.id").onDelete("RESTRICT");
    t.string("uploaded_at", 32).notNullable();
    t.unique(["lab_id", "sha256"]);
  });

  await knex.schema.createTable("runs", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.integer("raw_file_id").notNullable().references("raw_files.id").onDelete("RESTRICT");
    t.string("name", 255).notNullable();
    t.string("parser", 32).notNullable();
    t.string("study", 120).nullable();
    t.double("wavelength_nm").nullable();
    t.double("path_length_cm").nullable();
    t.double("temperature_c").nullable();
    t.string("cell", 64).nullable();
    t.string("operator", 120).nullable();
    t.string("sample", 120).nullable();
    t.string("method", 120).nullable();
    t.double("dilution_factor").nullable();
    t.text("metadata").notNullable(); // JSON, as found in the file
    t.text("warnings").notNullable(); // JSON array
    t.integer("created_by").nullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
    t.index(["lab_id", "created_at"]);
  });

  await knex.schema.createTable("series", (t) => {
    t.increments("id").primary();
    t.integer("run_id").notNullable().references("runs.id").onDelete("RESTRICT");
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.integer("position").notNullable();
    t.string("name", 200).notNullable();
    t.string("source_column", 200).notNullable();
    t.string("quantity", 48).notNullable();
    t.string("unit", 32).notNullable();
    t.integer("point_count").notNullable();
    t.binary("t_f64").notNullable();
    t.binary("y_f64").notNullable();
    t.text("skipped_lines").notNullable(); // JSON array of 1-based file lines
    t.text("processing").notNullable(); // JSON: blank subtracted, %T converted, …
    t.double("t_min").nullable();
    t.double("t_max").nullable();
    t.unique(["run_id", "position"]);
  });

  // A raw file is kept exactly as uploaded: the database refuses to change or remove it.
  if (String(knex.client.config.client).includes("sqlite")) {
    await knex.raw(`CREATE TRIGGER raw_files_no_update BEFORE UPDATE ON raw_files BEGIN SELECT RAISE(ABORT, 'raw_files are immutable'); END`);
    await knex.raw(`CREATE TRIGGER raw_files_no_delete BEFORE DELETE ON raw_files BEGIN SELECT RAISE(ABORT, 'raw_files are immutable'); END`);
  } else {
    await knex.raw(`CREATE OR REPLACE FUNCTION raw_files_refuse() RETURNS trigger AS $$
      BEGIN RAISE EXCEPTION 'raw_files are immutable'; END; $$ LANGUAGE plpgsql`);
    await knex.raw(`CREATE TRIGGER raw_files_immutable BEFORE UPDATE OR DELETE ON raw_files FOR EACH ROW EXECUTE FUNCTION raw_files_refuse()`);
  }
}

export async function down(knex: Knex): Promise<void> {
  if (!String(knex.client.config.client).includes("sqlite")) await knex.raw(`DROP FUNCTION IF EXISTS raw_files_refuse() CASCADE`);
  await knex.schema.dropTable("series");
  await knex.schema.dropTable("runs");
  await knex.schema.dropTable("raw_files");
}
