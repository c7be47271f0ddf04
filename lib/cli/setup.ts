// `cli setup --lab NAME --slug SLUG --admin-email EMAIL --admin-name NAME [--json]`: a lab and its first lab
// administrator in the configured database (migrated first when new), no demo data. The password comes from
// HALFLIGHT_ADMIN_PASSWORD, else standard input; refused input writes nothing.
import { parseArgs } from "node:util";
import { openConfiguredDb } from "@/db";
import { migrateToLatest } from "@/db/migrate";
import { setupLab, setupSchema } from "@/lib/admin/setup";
import { AppError } from "@/lib/errors";
import { CliError } from "./main";

async function readStdin(): Promise<string> {
  if (process.stdin.isTTY) process.stderr.write("Password for the lab administrator (then Enter; it is not shown in any file): ");
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const c of process.stdin) {
    chunks.push(c as Buffer);
    size += (c as Buffer).length;
    if (size > 4096) throw new CliError("the password on standard input is longer than any password may be.");
    if (process.stdin.isTTY && String(c).includes("\n")) break;
  }
  return Buffer.concat(chunks).toString("utf8").replace(/\r?\n$/, "");
}

export async function setupCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({
    args: argv,
    allowPositionals: false,
    options: { lab: { type: "string" }, slug: { type: "string" }, "admin-email": { type: "string" }, "admin-name": { type: "string" }, json: { type: "boolean" } },
  });
  const missing = (["lab", "slug", "admin-email", "admin-name"] as const).filter((k) => !values[k]);
  if (missing.length) throw new CliError(`setup needs ${missing.map((m) => `--${m}`).join(", ")}.`, 2);
  const password = process.env.HALFLIGHT_ADMIN_PASSWORD ?? (await readStdin());
  const parsed = setupSchema.safeParse({ lab: values.lab, slug: values.slug, adminEmail: values["admin-email"], adminName: values["admin-name"], password });
  if (!parsed.success) throw new CliError(parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("\n") + "\nNothing was written.");
  const { db } = openConfiguredDb();
  try {
    await migrateToLatest(db);
    return await setupLab(db, parsed.data, `cli setup (${process.env.USER ?? "unknown user"})`);
  } catch (e) {
    if (e instanceof AppError) throw new CliError(e.issues?.length && e.code === "unprocessable" ? `the password: ${e.message} Nothing was written.` : e.message);
    throw e;
  } finally {
    await db.destroy();
  }
}
