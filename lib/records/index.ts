// The one way to version a record (fits, studies, methods): the newest-version check happens inside the transaction
// that writes the new version, and UNIQUE(record_id, version) refuses a second writer of the same number, so two
// concurrent saves from one version give one new version and one 409, never a fork.
import type { Knex } from "knex";
import { AppError } from "@/lib/errors";

export type VersionedTable = "fits" | "studies" | "methods";

export interface VersionRef {
  id: number;
  record_id: number;
  version: number;
}

/** Inside the writing transaction: the number of the version to write, or 409 when `previous` is not the newest. */
export async function claimNextVersion(trx: Knex.Transaction, table: VersionedTable, labId: number, previous: VersionRef | null): Promise<number> {
  if (!previous) return 1;
  const newest = (await trx(table).where({ lab_id: labId, record_id: previous.record_id }).orderBy("version", "desc").first("id", "version")) as { id: number; version: number } | undefined;
  if (newest && newest.id !== previous.id)
    throw new AppError({ code: "conflict", message: `Version ${previous.version} is not the newest (version ${newest.version} is); open the newest before changing it.` });
  return previous.version + 1;
}

/** A unique-index violation, as better-sqlite3 and pg report it. */
export function isUniqueViolation(e: unknown): boolean {
  const err = e as { code?: string; message?: string };
  return err?.code === "SQLITE_CONSTRAINT_UNIQUE" || err?.code === "SQLITE_CONSTRAINT_PRIMARYKEY" || err?.code === "23505";
}

/** Runs a versioned write in one transaction; a concurrent writer of the same version number gets 409. */
export async function writeVersion<T>(db: Knex, fn: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  try {
    return await db.transaction(fn);
  } catch (e) {
    if (isUniqueViolation(e)) throw new AppError({ code: "conflict", message: "Someone saved a new version of this record at the same moment; open the newest and try again." });
    throw e;
  }
}
