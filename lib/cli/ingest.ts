// `cli ingest FILE [--lab SLUG] [--json]`: stores an export in DATABASE_FILE through the same ingest path and single
// transaction as the web upload (for scripts and instrument PCs).
import fs from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import { openConfiguredDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { resolveLabForCli } from "@/lib/admin/labs";
import { AppError } from "@/lib/errors";
import { ingestExport, startReadExport, type ReadExport } from "@/lib/ingest";
import { CliError } from "./main";

export async function ingestCommand(argv: string[]): Promise<unknown> {
  const { values, positionals } = parseArgs({ args: argv, allowPositionals: true, options: { lab: { type: "string" }, json: { type: "boolean" } } });
  const file = positionals[0];
  if (!file) throw new CliError("no FILE given.", 2);
  let bytes: Uint8Array;
  try {
    bytes = fs.readFileSync(file);
  } catch {
    throw new CliError(`${file}: no such file, or it cannot be read.`);
  }
  const fileName = path.basename(file);
  let parsing: Promise<ReadExport>;
  try {
    // The file is parsed on a worker thread while the database is opened and migrated (bench ingest: the whole
    // command against pandas + SQLite).
    parsing = startReadExport(bytes, fileName);
  } catch (e) {
    if (e instanceof AppError) throw new CliError(e.message);
    throw e;
  }
  const { db } = openConfiguredDb();
  try {
    await migrateToLatest(db);
    const lab = await resolveLabForCli(db, values.lab);
    const r = await ingestExport(db, { labId: lab.id, userId: null, actorLabel: `cli (${process.env.USER ?? "unknown user"})`, bytes, fileName, parsing });
    return { run_id: r.run_id, raw_file_sha256: r.raw_file_sha256, existing: r.existing, lab: lab.slug, series: r.series };
  } catch (e) {
    if (e instanceof AppError) throw new CliError(e.message);
    throw e;
  } finally {
    await db.destroy();
  }
}
