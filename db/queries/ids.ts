// Knex's `returning("id")` gives `{ id }` on SQLite and PostgreSQL; older drivers give the bare number.
export function insertedId(r: unknown): number {
  return typeof r === "object" && r !== null ? Number((r as { id: unknown }).id) : Number(r);
}
