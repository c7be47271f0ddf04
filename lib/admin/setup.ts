// A real lab's first start: the lab and its first lab administrator, with no demo data. Used by `cli setup`; the
// checks (slug and e-mail free) run inside the transaction that writes, and the database's UNIQUE constraints refuse
// a second writer of the same slug or e-mail.
import { createHash, randomBytes } from "node:crypto";
import type { Knex } from "knex";
import { z } from "zod";
import { countLabs, findLabBySlug, insertLab } from "@/db/queries/labs";
import { insertSetupToken, useSetupToken } from "@/db/queries/setup";
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

export async function setupLab(
  db: Knex,
  input: SetupInput,
  actor: string,
  now = new Date(),
  /** A check that must hold inside the writing transaction (the first-run page's token and "no lab yet"). */
  guard?: (trx: Knex.Transaction) => Promise<void>,
): Promise<{ lab_id: number; user_id: number }> {
  assertPassword(input.password, input.adminEmail, DEFAULT_SETTINGS.password_min_length);
  const hash = await hashPassword(input.password);
  const at = now.toISOString();
  return db.transaction(async (trx) => {
    await guard?.(trx);
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

const sha = (t: string) => createHash("sha256").update(t).digest("hex");
export const FIRST_RUN_HOURS = 24;

/**
 * A new install (no lab in the database): a one-time token for the first-run page, valid for a day, its SHA-256 kept.
 * Returns the token to print on the server's console, or null when the database already has a lab.
 */
export async function issueFirstRunToken(db: Knex, now = new Date()): Promise<string | null> {
  if ((await countLabs(db)) > 0) return null;
  const token = randomBytes(24).toString("base64url");
  await insertSetupToken(db, sha(token), now.toISOString(), new Date(now.getTime() + FIRST_RUN_HOURS * 3_600_000).toISOString());
  return token;
}

/** The first-run page: the lab and its first administrator, only with an unused token and only while there is no lab. */
export async function firstRunSetup(db: Knex, token: string, input: SetupInput, now = new Date()): Promise<{ lab_id: number; user_id: number }> {
  return setupLab(db, input, "first-run page", now, async (trx) => {
    if ((await countLabs(trx)) > 0) throw new AppError({ code: "conflict", message: "This installation already has a lab; sign in, or ask its administrator for an invitation. Nothing was written." });
    if (!(await useSetupToken(trx, sha(token), now.toISOString())))
      throw new AppError({ code: "forbidden", message: "That set-up token is not right, was used already, or has expired. Restart the server to print a new one on its console. Nothing was written." });
  });
}

/** True while the database has no lab (the first-run page is open only then). */
export async function needsFirstRun(db: Knex): Promise<boolean> {
  return (await countLabs(db)) === 0;
}
