// A real lab's first start: the lab and its first lab administrator, with no demo data. Used by `cli setup`; the
// checks (slug and e-mail free) run inside the transaction that writes, and the database's UNIQUE constraints refuse
// a second writer of the same slug or e-mail.
import type { Knex } from "knex";
import { z } from "zod";
import { findLabBySlug, insertLab } from "@/db/queries/labs";
import { findUserByEmail, insertMembership, insertUser } from "@/db/queries/users";
import { recordAudit } from "@/lib/audit";
import { hashPassword } from "@/lib/auth/password";
import { AppError } from "@/lib/errors";
import { lineText } from "@/lib/schemas/common";
import { assertPassword, DEFAULT_SETTINGS } from "./settings";

export const setupSchema = z.strictObject({
  lab: lineText(200).pipe(z.string().min(2, "Give the lab a name of at least 2 characters.")),
  slug: z.string().regex(/^[a-z0-9](?:[a-z0-9-]{0,62}[a-z0-9])?$/, "A slug is lower-case letters, digits and dashes (for example north-lab), at most 64 characters."),
  adminEmail: z.string().trim().toLowerCase().email("Give the administrator's e-mail address.").max(254),
  adminName: lineText(200).pipe(z.string().min(1, "Give the administrator's name.")),
  password: z.string().max(256, "A password may have at most 256 characters."),
});
export type SetupInput = z.infer<typeof setupSchema>;

export async function setupLab(db: Knex, input: SetupInput, actor: string, now = new Date()): Promise<{ lab_id: number; user_id: number }> {
  assertPassword(input.password, input.adminEmail, DEFAULT_SETTINGS.password_min_length);
  const hash = await hashPassword(input.password);
  const at = now.toISOString();
  return db.transaction(async (trx) => {
    if (await findLabBySlug(trx, input.slug)) throw new AppError({ code: "conflict", message: `A lab with the slug "${input.slug}" already exists; nothing was written.` });
    if (await findUserByEmail(trx, input.adminEmail)) throw new AppError({ code: "conflict", message: `${input.adminEmail} already has an account; nothing was written.` });
    const lab = await insertLab(trx, { slug: input.slug, name: input.lab, createdAt: at });
    const user = await insertUser(trx, { email: input.adminEmail, displayName: input.adminName, passwordHash: hash, createdAt: at });
    await insertMembership(trx, { userId: user.id, labId: lab.id, role: "admin", createdAt: at });
    await recordAudit(trx, { labId: lab.id, actorUserId: null, actorLabel: actor, action: "lab.created", objectType: "lab", objectId: lab.id, newValues: { slug: lab.slug, name: lab.name }, reason: "set-up of a new lab" }, now);
    await recordAudit(trx, { labId: lab.id, actorUserId: null, actorLabel: actor, action: "member.added", objectType: "user", objectId: user.id, newValues: { email: user.email, name: user.display_name, role: "admin" }, reason: "the lab's first administrator" }, now);
    return { lab_id: lab.id, user_id: user.id };
  });
}
