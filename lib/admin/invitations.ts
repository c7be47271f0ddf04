// Invitations: an administrator invites a person by e-mail with a role; the mail carries a one-time link (192 random
// bits, only the SHA-256 stored) that expires; following it, the invitee sets a password under the lab's rules and the
// account and membership are created in one transaction. Every step is audited.
import { createHash, randomBytes } from "node:crypto";
import type { Knex } from "knex";
import { findInvitation, findInvitationByTokenHash, insertInvitation, listInvitationRows, markInvitation } from "@/db/queries/admin";
import { findLabById } from "@/db/queries/labs";
import { findUserByEmail, insertMembership, insertUser } from "@/db/queries/users";
import { recordAudit } from "@/lib/audit";
import { hashPassword } from "@/lib/auth/password";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { appUrl, linkMail, sendMail } from "@/lib/mail";
import { ROLE_LABELS } from "@/lib/permissions";
import type { InviteInput } from "@/lib/schemas/admin";
import { assertPassword, getLabSettings } from "./settings";

const tokenHash = (t: string) => createHash("sha256").update(t).digest("hex");

export async function inviteUser(db: Knex, admin: SignedInUser, input: InviteInput, now = new Date()) {
  const existing = await findUserByEmail(db, input.email);
  if (existing) throw new AppError({ code: "conflict", message: `${input.email} already has an account; change its role on the members list instead.` });
  const token = randomBytes(24).toString("base64url");
  const expires = new Date(now.getTime() + input.days * 86_400_000).toISOString();
  const id = await db.transaction(async (trx) => {
    const invitationId = await insertInvitation(trx, {
      lab_id: admin.labId,
      email: input.email,
      display_name: input.name,
      role: input.role,
      token_hash: tokenHash(token),
      expires_at: expires,
      accepted_at: null,
      revoked_at: null,
      user_id: null,
      invited_by: admin.userId,
      created_at: now.toISOString(),
    });
    await recordAudit(trx, { labId: admin.labId, actorUserId: admin.userId, action: "invitation.created", objectType: "invitation", objectId: invitationId, newValues: { email: input.email, name: input.name, role: input.role, expires_at: expires } });
    return invitationId;
  });
  const url = appUrl(`/invite/${token}`);
  const sent = await sendMail(
    linkMail(
      [input.email],
      `You are invited to ${admin.labName} on Halflight`,
      [
        `${admin.name} invited you to join ${admin.labName} as ${ROLE_LABELS[input.role].toLowerCase()}.`,
        `Open the link to set your password. It works once and expires ${expires.slice(0, 16).replace("T", " ")} UTC.`,
      ],
      url,
    ),
  );
  return { id, expires_at: expires, mailed: sent, path: `/invite/${token}` };
}

export async function listInvitations(db: Knex, labId: number, now = new Date()) {
  return (await listInvitationRows(db, labId)).map((r) => ({
    id: r.id,
    email: r.email,
    name: r.display_name,
    role: r.role,
    invited_by: r.invited_by_name,
    created_at: r.created_at,
    expires_at: r.expires_at,
    state: r.accepted_at ? "accepted" : r.revoked_at ? "revoked" : Date.parse(r.expires_at) <= now.getTime() ? "expired" : "open",
  }));
}

export async function revokeInvitation(db: Knex, admin: SignedInUser, id: number) {
  const inv = await findInvitation(db, admin.labId, id);
  if (!inv) throw new AppError({ code: "not_found", message: `There is no invitation ${id} in this lab.` });
  if (inv.accepted_at) throw new AppError({ code: "conflict", message: `${inv.email} already accepted; deactivate the account instead.` });
  if (inv.revoked_at) return { revoked_at: inv.revoked_at };
  const at = new Date().toISOString();
  await db.transaction(async (trx) => {
    await markInvitation(trx, id, { revoked_at: at });
    await recordAudit(trx, { labId: admin.labId, actorUserId: admin.userId, action: "invitation.revoked", objectType: "invitation", objectId: id, newValues: { email: inv.email } });
  });
  return { revoked_at: at };
}

/** An invitation as its link shows it, or a plain message why it no longer works. */
export async function openInvitation(db: Knex, token: string, now = new Date()) {
  const inv = await findInvitationByTokenHash(db, tokenHash(token));
  if (!inv) throw new AppError({ code: "not_found", message: "This invitation link is not known. Ask your lab administrator for a new one." });
  if (inv.accepted_at) throw new AppError({ code: "gone", message: "This invitation has been used already. Sign in with the password you set." });
  if (inv.revoked_at) throw new AppError({ code: "gone", message: "This invitation was withdrawn. Ask your lab administrator for a new one." });
  if (Date.parse(inv.expires_at) <= now.getTime()) throw new AppError({ code: "gone", message: `This invitation expired on ${inv.expires_at.slice(0, 16).replace("T", " ")} UTC. Ask your lab administrator for a new one.` });
  const lab = await findLabById(db, inv.lab_id);
  const settings = await getLabSettings(db, inv.lab_id);
  return { invitation: inv, lab: { id: inv.lab_id, name: lab?.name ?? "" }, password_min_length: settings.password_min_length };
}

export async function acceptInvitation(db: Knex, token: string, password: string, now = new Date()) {
  const { invitation: inv, password_min_length } = await openInvitation(db, token, now);
  assertPassword(password, inv.email, password_min_length);
  const hash = await hashPassword(password);
  return db.transaction(async (trx) => {
    if (await findUserByEmail(trx, inv.email)) throw new AppError({ code: "conflict", message: `${inv.email} already has an account. Sign in instead.` });
    const user = await insertUser(trx, { email: inv.email, displayName: inv.display_name, passwordHash: hash, createdAt: now.toISOString() });
    await insertMembership(trx, { userId: user.id, labId: inv.lab_id, role: inv.role, createdAt: now.toISOString() });
    // The link works once: a second, concurrent acceptance updates nothing and rolls back.
    if ((await markInvitation(trx, inv.id, { accepted_at: now.toISOString(), user_id: user.id })) !== 1) throw new AppError({ code: "gone", message: "This invitation has been used already." });
    await recordAudit(trx, { labId: inv.lab_id, actorUserId: user.id, action: "invitation.accepted", objectType: "invitation", objectId: inv.id, newValues: { user_id: user.id, email: inv.email, role: inv.role } });
    return { email: inv.email, role: inv.role };
  });
}
