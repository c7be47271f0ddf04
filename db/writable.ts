// Can the database take a write? Checked at start so that a read-only file, folder or disk stops the server with a
// message, instead of a server that says "Ready" and fails every request.
import type { Knex } from "knex";
import { migrateToLatest } from "./migrate";

class ProbeDone extends Error {}

/** Migrates, then writes one row of the migrations' lock table inside a transaction that is rolled back. */
export async function checkWritable(db: Knex, where: string): Promise<void> {
  try {
    await migrateToLatest(db);
    await db.transaction(async (trx) => {
      await trx("knex_migrations_lock").update({ is_locked: trx.raw("is_locked") });
      throw new ProbeDone();
    });
  } catch (e) {
    if (e instanceof ProbeDone) return;
    const code = (e as { code?: string }).code ?? "";
    const why = /READONLY|25006|EACCES|EROFS|EPERM/.test(code + String(e))
      ? "it is read-only (check the permissions of the file and its folder, and that the disk is mounted for writing)"
      : /FULL|53100|ENOSPC/.test(code + String(e))
        ? "the disk is full"
        : `it answered: ${e instanceof Error ? e.message : String(e)}`;
    throw new Error(`Halflight will not start: the database ${where} cannot be written, because ${why}. Nothing was changed.`);
  }
}
