// The demo scenario (invented): Larkspur Stability Services, a contract stability lab, follows the colour loss of
// "corvane blue", a fictional dye, at 590 nm and four temperatures. This seed creates the lab and one person per role;
// the ingest work adds its runs as real export files.
import type { Knex } from "knex";
import { insertLab, countLabs } from "@/db/queries/labs";
import { insertMembership, insertUser } from "@/db/queries/users";
import { recordAudit } from "@/lib/audit";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/permissions/roles";

export const DEMO_LAB = { slug: "larkspur", name: "Larkspur Stability Services" } as const;

/** Demo accounts only: these passwords are printed in the README and must never guard real data. */
export const DEMO_USERS: ReadonlyArray<{ email: string; name: string; role: Role; password: string }> = [
  { email: "ines.marsh@larkspur.example", name: "Ines Marsh", role: "admin", password: "demo-admin-pass" },
  { email: "teodor.vale@larkspur.example", name: "Teodor Vale", role: "method_developer", password: "demo-method-pass" },
  { email: "amara.quist@larkspur.example", name: "Amara Quist", role: "analyst", password: "demo-analyst-pass" },
  { email: "rafe.okonkwo@larkspur.example", name: "Rafe Okonkwo", role: "reviewer", password: "demo-review-pass" },
];

/** Seeds the demo lab when the database has no lab yet; returns whether it did. */
export async function seedDemoWhenEmpty(db: Knex, now: Date = new Date()): Promise<boolean> {
  if ((await countLabs(db)) > 0) return false;
  const hashes = await Promise.all(DEMO_USERS.map((u) => hashPassword(u.password)));
  await db.transaction(async (trx) => {
    const at = now.toISOString();
    const lab = await insertLab(trx, { ...DEMO_LAB, createdAt: at });
    for (const [i, u] of DEMO_USERS.entries()) {
      const user = await insertUser(trx, { email: u.email, displayName: u.name, passwordHash: hashes[i]!, createdAt: at });
      await insertMembership(trx, { userId: user.id, labId: lab.id, role: u.role, createdAt: at });
    }
    await recordAudit(trx, {
      labId: lab.id,
      actorUserId: null,
      actorLabel: "demo seed",
      action: "lab.created",
      objectType: "lab",
      objectId: lab.id,
      newValues: { slug: lab.slug, name: lab.name, members: DEMO_USERS.map((u) => ({ email: u.email, role: u.role })) },
      reason: "demo scenario",
    }, now);
  });
  return true;
}
