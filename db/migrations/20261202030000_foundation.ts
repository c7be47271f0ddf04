// Labs, users, memberships (role per lab) and the append-only audit trail.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("labs", (t) => {
    t.increments("id").primary();
    t.string("slug", 64).notNullable().unique();
    t.string("name", 200).notNullable();
    t.string("created_at", 32).notNullable();
  });

  await knex.schema.createTable("users", (t) => {
    t.increments("id").primary();
    t.string("email", 254).notNullable().unique();
    t.string("display_name", 200).notNullable();
    t.string("password_hash", 255).notNullable();
    t.integer("failed_sign_ins").notNullable().defaultTo(0);
    t.string("locked_until", 32).nullable();
    t.boolean("disabled").notNullable().defaultTo(false);
    t.string("created_at", 32).notNullable();
  });

  await knex.schema.createTable("memberships", (t) => {
    t.increments("id").primary();
    t.integer("user_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.integer("lab_id").notNullable().references("labs.id").onDelete("RESTRICT");
    t.string("role", 32).notNullable();
    t.string("created_at", 32).notNullable();
    t.unique(["user_id", "lab_id"]);
  });

  await knex.schema.createTable("audit_events", (t) => {
    t.increments("id").primary();
    t.integer("lab_id").nullable().references("labs.id").onDelete("RESTRICT");
    t.integer("actor_user_id").nullable().references("users.id").onDelete("RESTRICT");
    t.string("actor_label", 254).nullable(); // e.g. the e-mail typed at a failed sign-in
    t.string("at", 32).notNullable(); // server clock, ISO 8601 UTC
    t.string("action", 64).notNullable();
    t.string("object_type", 64).nullable();
    t.string("object_id", 64).nullable();
    t.integer("object_version").nullable();
    t.text("old_values").nullable(); // JSON
    t.text("new_values").nullable(); // JSON
    t.text("reason").nullable();
    t.string("prev_hash", 64).nullable();
    t.string("hash", 64).notNullable().unique();
    t.index(["lab_id", "at"]);
  });

  // Append-only: the database itself refuses to change or remove an audit row.
  if (isSqlite(knex)) {
    await knex.raw(
      `CREATE TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events BEGIN SELECT RAISE(ABORT, 'audit_events is append-only'); END`,
    );
    await knex.raw(
      `CREATE TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events BEGIN SELECT RAISE(ABORT, 'audit_events is append-only'); END`,
    );
  } else {
    await knex.raw(`CREATE OR REPLACE FUNCTION audit_events_refuse() RETURNS trigger AS $$
      BEGIN RAISE EXCEPTION 'audit_events is append-only'; END; $$ LANGUAGE plpgsql`);
    await knex.raw(
      `CREATE TRIGGER audit_events_append_only BEFORE UPDATE OR DELETE ON audit_events FOR EACH ROW EXECUTE FUNCTION audit_events_refuse()`,
    );
  }
}

export async function down(knex: Knex): Promise<void> {
  if (!isSqlite(knex)) await knex.raw(`DROP FUNCTION IF EXISTS audit_events_refuse() CASCADE`);
  await knex.schema.dropTable("audit_events");
  await knex.schema.dropTable("memberships");
  await knex.schema.dropTable("users");
  await knex.schema.dropTable("labs");
}

function isSqlite(knex: Knex): boolean {
  const client = String(knex.client.config.client);
  return client.includes("sqlite");
}
