// fits.state was never more than "draft": the review state lives in review events and review_heads. The column goes;
// the immutability guard is rewritten without it (and compares every stored field), and fit and study versions get
// the same guard on PostgreSQL that they have on SQLite.
import type { Knex } from "knex";

const isSqlite = (knex: Knex) => String(knex.client.config.client).includes("sqlite");
const FIT_FIELDS = ["lab_id", "run_id", "series_id", "version", "previous_id", "title", "primary_model", "k_value", "k_se", "criteria_failed", "options", "results", "engine_version", "data_sha256", "content_hash", "reason", "author_id", "created_at"];

export async function up(knex: Knex): Promise<void> {
  if (isSqlite(knex)) {
    await knex.raw("DROP TRIGGER fits_immutable");
    await knex.raw("ALTER TABLE fits DROP COLUMN state");
    const same = FIT_FIELDS.map((f) => `NEW.${f} IS OLD.${f}`).join(" AND ");
    await knex.raw(`CREATE TRIGGER fits_immutable BEFORE UPDATE ON fits WHEN NOT (OLD.record_id IS NULL AND NEW.record_id = OLD.id AND ${same})
      BEGIN SELECT RAISE(ABORT, 'fit versions are immutable'); END`);
  } else {
    await knex.schema.alterTable("fits", (t) => t.dropColumn("state"));
    for (const table of ["fits", "studies"]) {
      // Only the record id of a first version may be filled in (it is its own id); nothing else changes, nothing is deleted.
      await knex.raw(`CREATE OR REPLACE FUNCTION ${table}_refuse() RETURNS trigger AS $$
        BEGIN
          IF TG_OP = 'UPDATE' AND OLD.record_id IS NULL AND NEW.record_id = OLD.id AND (to_jsonb(NEW) - 'record_id') = (to_jsonb(OLD) - 'record_id') THEN RETURN NEW; END IF;
          RAISE EXCEPTION '${table === "fits" ? "fit" : "study"} versions are immutable';
        END; $$ LANGUAGE plpgsql`);
      await knex.raw(`CREATE TRIGGER ${table}_immutable BEFORE UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION ${table}_refuse()`);
    }
  }
}

export async function down(knex: Knex): Promise<void> {
  if (isSqlite(knex)) {
    await knex.raw("DROP TRIGGER fits_immutable");
    await knex.raw("ALTER TABLE fits ADD COLUMN state varchar(16) NOT NULL DEFAULT 'draft'");
    await knex.raw(`CREATE TRIGGER fits_immutable BEFORE UPDATE ON fits WHEN NOT (OLD.record_id IS NULL AND NEW.record_id = OLD.id AND
      NEW.options = OLD.options AND NEW.results = OLD.results AND NEW.content_hash = OLD.content_hash AND NEW.state = OLD.state)
      BEGIN SELECT RAISE(ABORT, 'fit versions are immutable'); END`);
  } else {
    for (const table of ["fits", "studies"]) await knex.raw(`DROP FUNCTION IF EXISTS ${table}_refuse() CASCADE`);
    await knex.schema.alterTable("fits", (t) => t.string("state", 16).notNullable().defaultTo("draft"));
  }
}
