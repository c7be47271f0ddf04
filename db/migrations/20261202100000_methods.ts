// Methods (versioned templates with acceptance criteria), calibration curves, a run's method, lab settings,
// invitations and instrument API keys.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("calibrations", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("name", 200).notNullable();
    t.string("analyte", 200).notNullable();
    t.string("concentration_unit", 32).notNullable();
    t.double("wavelength_nm").nullable();
    t.text("standards").notNullable(); // JSON [{concentration, absorbance, replicate}]
    t.text("options").notNullable(); // JSON {through_origin, weighting, sigma, blank_sd}
    t.text("results").notNullable(); // JSON: slope, intercept, SEs, r², LOD, LOQ, residuals, linearity
    t.double("slope").notNullable();
    t.double("lod").notNullable();
    t.double("loq").notNullable();
    t.string("engine_version", 64).notNullable();
    t.string("content_hash", 64).notNullable();
    t.integer("author_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
    t.index(["lab_id", "created_at"]);
  });

  await knex.schema.createTable("methods", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.integer("record_id").nullable(); // the first version's id
    t.integer("version").notNullable();
    t.integer("previous_id").nullable().references("methods.id").onDelete("RESTRICT");
    t.string("name", 200).notNullable();
    t.string("analyte", 200).notNullable();
    t.text("definition").notNullable(); // JSON, see lib/schemas/methods.ts
    t.integer("calibration_id").nullable().references("calibrations.id").onDelete("RESTRICT");
    t.string("content_hash", 64).notNullable();
    t.text("reason").nullable();
    t.integer("author_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
    t.index(["lab_id", "record_id"]);
  });

  await knex.schema.alterTable("runs", (t) => {
    t.integer("method_record_id").nullable(); // a method record; its newest version applies when a fit is saved
  });
  await knex.schema.alterTable("fits", (t) => {
    t.integer("criteria_failed").nullable(); // null: no method; else how many of its criteria the version failed
  });

  await knex.schema.createTable("lab_settings", (t) => {
    t.integer("lab_id").primary().references("labs.id").onDelete("RESTRICT");
    t.boolean("outside_links").notNullable().defaultTo(true);
    t.integer("default_link_days").notNullable().defaultTo(14);
    t.integer("upload_limit_mb").notNullable().defaultTo(50);
    t.integer("password_min_length").notNullable().defaultTo(12);
    t.string("updated_at", 32).notNullable();
  });

  await knex.schema.createTable("invitations", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("email", 254).notNullable();
    t.string("display_name", 200).notNullable();
    t.string("role", 32).notNullable();
    t.string("token_hash", 64).notNullable().unique();
    t.string("expires_at", 32).notNullable();
    t.string("accepted_at", 32).nullable();
    t.string("revoked_at", 32).nullable();
    t.integer("user_id").nullable().references("users.id").onDelete("RESTRICT");
    t.integer("invited_by").notNullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
  });

  await knex.schema.createTable("api_keys", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("name", 120).notNullable();
    t.string("prefix", 16).notNullable(); // shown in lists so a key can be recognised
    t.string("key_hash", 64).notNullable().unique();
    t.integer("created_by").notNullable().references("users.id").onDelete("RESTRICT");
    t.string("created_at", 32).notNullable();
    t.string("last_used_at", 32).nullable();
    t.string("revoked_at", 32).nullable();
  });

  // Calibrations and method versions are records: the database refuses to change or remove them.
  if (String(knex.client.config.client).includes("sqlite")) {
    for (const table of ["calibrations"]) {
      await knex.raw(`CREATE TRIGGER ${table}_no_update BEFORE UPDATE ON ${table} BEGIN SELECT RAISE(ABORT, '${table} are immutable'); END`);
      await knex.raw(`CREATE TRIGGER ${table}_no_delete BEFORE DELETE ON ${table} BEGIN SELECT RAISE(ABORT, '${table} are immutable'); END`);
    }
    // A method version may only have its record_id filled in once (the first version points at itself).
    await knex.raw(
      `CREATE TRIGGER methods_no_update BEFORE UPDATE ON methods WHEN NOT (OLD.record_id IS NULL AND NEW.record_id = OLD.id AND NEW.definition = OLD.definition AND NEW.content_hash = OLD.content_hash) BEGIN SELECT RAISE(ABORT, 'method versions are immutable'); END`,
    );
    await knex.raw(`CREATE TRIGGER methods_no_delete BEFORE DELETE ON methods BEGIN SELECT RAISE(ABORT, 'method versions are immutable'); END`);
  } else {
    await knex.raw(`CREATE OR REPLACE FUNCTION calibrations_refuse() RETURNS trigger AS $$
      BEGIN RAISE EXCEPTION 'calibrations are immutable'; END; $$ LANGUAGE plpgsql`);
    await knex.raw(`CREATE TRIGGER calibrations_immutable BEFORE UPDATE OR DELETE ON calibrations FOR EACH ROW EXECUTE FUNCTION calibrations_refuse()`);
    await knex.raw(`CREATE OR REPLACE FUNCTION methods_refuse() RETURNS trigger AS $$
      BEGIN
        IF TG_OP = 'UPDATE' AND OLD.record_id IS NULL AND NEW.record_id = OLD.id AND NEW.definition = OLD.definition AND NEW.content_hash = OLD.content_hash THEN RETURN NEW; END IF;
        RAISE EXCEPTION 'method versions are immutable';
      END; $$ LANGUAGE plpgsql`);
    await knex.raw(`CREATE TRIGGER methods_immutable BEFORE UPDATE OR DELETE ON methods FOR EACH ROW EXECUTE FUNCTION methods_refuse()`);
  }
}

export async function down(knex: Knex): Promise<void> {
  if (!String(knex.client.config.client).includes("sqlite")) {
    await knex.raw(`DROP FUNCTION IF EXISTS methods_refuse() CASCADE`);
    await knex.raw(`DROP FUNCTION IF EXISTS calibrations_refuse() CASCADE`);
  }
  await knex.schema.dropTable("api_keys");
  await knex.schema.dropTable("invitations");
  await knex.schema.dropTable("lab_settings");
  await knex.schema.alterTable("fits", (t) => t.dropColumn("criteria_failed"));
  await knex.schema.alterTable("runs", (t) => t.dropColumn("method_record_id"));
  await knex.schema.dropTable("methods");
  await knex.schema.dropTable("calibrations");
}
