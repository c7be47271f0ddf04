// Records that hold under concurrency and tampering: one review state per record version changed only by a conditional
// statement, unique version numbers, a per-user session version, runs and series the database refuses to change, and
// the audit trail's keyed head (row count, newest row, its MAC) written with every event. SQLite and PostgreSQL.
import type { Knex } from "knex";

const isSqlite = (knex: Knex) => String(knex.client.config.client).includes("sqlite");

export async function up(knex: Knex): Promise<void> {
  // The current review state of each record version, for compare-and-set transitions.
  await knex.schema.createTable("review_heads", (t) => {
    t.string("object_type", 16).notNullable();
    t.integer("object_id").notNullable();
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("state", 16).notNullable();
    t.integer("seq").notNullable();
    t.primary(["object_type", "object_id"]);
  });
  // Backfill from the events already there: the newest event of each object is its state.
  await knex.raw(`INSERT INTO review_heads (object_type, object_id, lab_id, state, seq)
    SELECT e.object_type, e.object_id, e.lab_id, e.state, (SELECT COUNT(*) FROM review_events c WHERE c.object_type = e.object_type AND c.object_id = e.object_id)
    FROM review_events e
    WHERE e.id = (SELECT MAX(m.id) FROM review_events m WHERE m.object_type = e.object_type AND m.object_id = e.object_id)`);

  // No two versions of one record share a number.
  for (const table of ["fits", "studies", "methods"]) await knex.schema.alterTable(table, (t) => t.unique(["record_id", "version"], { indexName: `${table}_record_version_unique` }));

  // Sessions end: a token carries the session version it was issued under; sign-out, deactivation and role changes bump it.
  await knex.schema.alterTable("users", (t) => t.integer("session_version").notNullable().defaultTo(0));

  // The audit trail's head, rewritten in the transaction of every event: a deleted newest row or a re-hashed chain no
  // longer matches it, and its MAC needs the server's audit key, kept apart from the data.
  await knex.schema.createTable("audit_head", (t) => {
    t.integer("id").primary();
    t.integer("row_count").notNullable();
    t.integer("head_id").nullable();
    t.string("head_hash", 64).nullable();
    t.string("mac", 64).nullable();
    t.string("updated_at", 32).notNullable();
  });
  await knex.schema.alterTable("audit_events", (t) => t.string("mac", 64).nullable());
  const count = Number(((await knex("audit_events").count({ n: "*" })) as Array<{ n: number | string }>)[0]!.n);
  const last = (await knex("audit_events").orderBy("id", "desc").first("id", "hash")) as { id: number; hash: string } | undefined;
  // Rows before this migration carry no MAC; the head starts unkeyed and is keyed by the first event after it.
  await knex("audit_head").insert({ id: 1, row_count: count, head_id: last?.id ?? null, head_hash: last?.hash ?? null, mac: null, updated_at: new Date().toISOString() });

  // Runs and series behind records: a run's method may be (re)assigned, audited; nothing else of a run or a series changes.
  if (isSqlite(knex)) {
    await knex.raw(`CREATE TRIGGER runs_immutable BEFORE UPDATE ON runs
      WHEN NOT (NEW.id = OLD.id AND NEW.lab_id = OLD.lab_id AND NEW.raw_file_id = OLD.raw_file_id AND NEW.name = OLD.name AND NEW.parser = OLD.parser
        AND NEW.study IS OLD.study AND NEW.wavelength_nm IS OLD.wavelength_nm AND NEW.path_length_cm IS OLD.path_length_cm
        AND NEW.temperature_c IS OLD.temperature_c AND NEW.cell IS OLD.cell AND NEW.operator IS OLD.operator AND NEW.sample IS OLD.sample
        AND NEW.dilution_factor IS OLD.dilution_factor AND NEW.metadata = OLD.metadata AND NEW.warnings = OLD.warnings
        AND NEW.created_by IS OLD.created_by AND NEW.created_at = OLD.created_at)
      BEGIN SELECT RAISE(ABORT, 'runs are immutable (only the method may be reassigned)'); END`);
    await knex.raw(`CREATE TRIGGER runs_no_delete BEFORE DELETE ON runs BEGIN SELECT RAISE(ABORT, 'runs are immutable'); END`);
    await knex.raw(`CREATE TRIGGER series_no_update BEFORE UPDATE ON series BEGIN SELECT RAISE(ABORT, 'series are immutable'); END`);
    await knex.raw(`CREATE TRIGGER series_no_delete BEFORE DELETE ON series BEGIN SELECT RAISE(ABORT, 'series are immutable'); END`);
  } else {
    await knex.raw(`CREATE OR REPLACE FUNCTION runs_refuse() RETURNS trigger AS $$
      BEGIN
        IF TG_OP = 'UPDATE' AND (to_jsonb(NEW) - 'method' - 'method_record_id') = (to_jsonb(OLD) - 'method' - 'method_record_id') THEN RETURN NEW; END IF;
        RAISE EXCEPTION 'runs are immutable (only the method may be reassigned)';
      END; $$ LANGUAGE plpgsql`);
    await knex.raw(`CREATE TRIGGER runs_immutable BEFORE UPDATE OR DELETE ON runs FOR EACH ROW EXECUTE FUNCTION runs_refuse()`);
    await knex.raw(`CREATE OR REPLACE FUNCTION series_refuse() RETURNS trigger AS $$ BEGIN RAISE EXCEPTION 'series are immutable'; END; $$ LANGUAGE plpgsql`);
    await knex.raw(`CREATE TRIGGER series_immutable BEFORE UPDATE OR DELETE ON series FOR EACH ROW EXECUTE FUNCTION series_refuse()`);
    // Review events, signatures and comments: append-only on PostgreSQL as on SQLite.
    for (const table of ["signatures", "review_events", "comments", "validation_runs"]) {
      await knex.raw(`CREATE OR REPLACE FUNCTION ${table}_refuse() RETURNS trigger AS $$ BEGIN RAISE EXCEPTION '${table} are append-only'; END; $$ LANGUAGE plpgsql`);
      await knex.raw(`CREATE TRIGGER ${table}_append_only BEFORE UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION ${table}_refuse()`);
    }
  }
}

export async function down(knex: Knex): Promise<void> {
  if (isSqlite(knex)) {
    for (const trg of ["runs_immutable", "runs_no_delete", "series_no_update", "series_no_delete"]) await knex.raw(`DROP TRIGGER IF EXISTS ${trg}`);
  } else {
    for (const fn of ["runs_refuse", "series_refuse", "signatures_refuse", "review_events_refuse", "comments_refuse", "validation_runs_refuse"]) await knex.raw(`DROP FUNCTION IF EXISTS ${fn}() CASCADE`);
  }
  await knex.schema.alterTable("audit_events", (t) => t.dropColumn("mac"));
  await knex.schema.dropTable("audit_head");
  await knex.schema.alterTable("users", (t) => t.dropColumn("session_version"));
  for (const table of ["fits", "studies", "methods"]) await knex.schema.alterTable(table, (t) => t.dropUnique(["record_id", "version"], `${table}_record_version_unique`));
  await knex.schema.dropTable("review_heads");
}
