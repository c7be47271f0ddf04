// Choosing the lab for command-line work: by slug, else the only lab; a new database gets a lab named "default".
import type { Knex } from "knex";
import { findLabBySlug, insertLab, listLabs } from "@/db/queries/labs";
import { recordAudit } from "@/lib/audit";
import { AppError } from "@/lib/errors";

export async function resolveLabForCli(db: Knex, slug?: string) {
  if (slug) {
    const lab = await findLabBySlug(db, slug);
    if (!lab) throw new AppError({ code: "not_found", message: `there is no lab with the slug "${slug}".` });
    return lab;
  }
  const labs = await listLabs(db);
  if (labs.length === 1) return labs[0]!;
  if (labs.length > 1) throw new AppError({ code: "bad_request", message: `the database has ${labs.length} labs; name one with --lab (${labs.map((l) => l.slug).join(", ")}).` });
  return db.transaction(async (trx) => {
    const lab = await insertLab(trx, { slug: "default", name: "Default lab", createdAt: new Date().toISOString() });
    await recordAudit(trx, { labId: lab.id, actorUserId: null, actorLabel: "cli", action: "lab.created", objectType: "lab", objectId: lab.id, reason: "first ingest into a new database" });
    return lab;
  });
}
