// Share links: one pinned record version (a fit or a study), a random 192-bit token of which only the SHA-256 is
// stored, an expiry (14 days by default), revocation, and every open logged.
import { createHash, randomBytes } from "node:crypto";
import type { Knex } from "knex";
import { getFit } from "@/db/queries/fits";
import { getStudy } from "@/db/queries/studies";
import { findLabById } from "@/db/queries/labs";
import { listLabMembers } from "@/db/queries/users";
import { findShareLink, findShareLinkByTokenHash, insertShareLink, insertShareView, revokeShareLink, shareLinksOf } from "@/db/queries/sharing";
import { getLabSettings } from "@/lib/admin/settings";
import { recordAudit } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { can } from "@/lib/permissions";
import { appUrl, linkMail, sendMail } from "@/lib/mail";

const tokenHash = (t: string) => createHash("sha256").update(t).digest("hex");
export const DEFAULT_SHARE_DAYS = 14;

export type SharedObject = "fit" | "study";

/** The record version a link pins: its record id, version and title (404 when it is not in the lab). */
async function sharedVersion(db: Knex, labId: number, type: SharedObject, id: number): Promise<{ record_id: number; version: number; title: string }> {
  if (type === "fit") {
    const f = await getFit(db, labId, id);
    if (!f) throw new AppError({ code: "not_found", message: `There is no fit ${id} in this lab.` });
    return { record_id: f.record_id!, version: f.version, title: f.title };
  }
  const s = await getStudy(db, labId, id);
  if (!s) throw new AppError({ code: "not_found", message: `There is no study ${id} in this lab.` });
  return { record_id: s.record_id ?? s.id, version: s.version, title: s.name };
}

export async function createShareLink(
  db: Knex,
  user: SignedInUser,
  fitId: number,
  opts: { recipient?: string | null; days?: number; mail?: { subject: string; lines: string[] }; type?: SharedObject },
) {
  const type = opts.type ?? "fit";
  // A link opens the record for others: only someone who may read the record may make one.
  if (!can(user, type === "fit" ? "fit:read" : "study:read")) throw new AppError({ code: "forbidden", message: `Your role does not read ${type} records, so it cannot share them.` });
  const f = await sharedVersion(db, user.labId, type, fitId);
  const token = randomBytes(24).toString("base64url");
  const now = new Date();
  const settings = await getLabSettings(db, user.labId);
  const days = opts.days ?? settings.default_link_days ?? DEFAULT_SHARE_DAYS;
  if (opts.recipient && !settings.outside_links) {
    const members = await listLabMembers(db, user.labId);
    if (!members.some((m) => m.email.toLowerCase() === opts.recipient!.trim().toLowerCase()))
      throw new AppError({ code: "forbidden", message: `${opts.recipient} is not a member of ${user.labName}, and this lab does not allow share links for outside reviewers (Lab settings).` });
  }
  const expires = new Date(now.getTime() + days * 86_400_000).toISOString();
  const id = await db.transaction(async (trx) => {
    const linkId = await insertShareLink(trx, { lab_id: user.labId, token_sha256: tokenHash(token), object_type: type, object_id: fitId, recipient: opts.recipient ?? null, expires_at: expires, revoked_at: null, revoked_by: null, created_by: user.userId, created_at: now.toISOString() });
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: "share.created", objectType: type, objectId: f.record_id, objectVersion: f.version, newValues: { share_link_id: linkId, recipient: opts.recipient ?? null, expires_at: expires } });
    return linkId;
  });
  const url = appUrl(`/share/${token}`);
  if (opts.recipient) {
    const subject = opts.mail?.subject ?? `Shared with you: ${f.title} (version ${f.version})`;
    const lines = opts.mail?.lines ?? [`${user.name} shared version ${f.version} of "${f.title}" with you, read-only.`];
    await sendMail(linkMail([opts.recipient], subject, [...lines, `The link opens for signed-in members of ${user.labName} and expires ${expires.slice(0, 10)}.`], url));
  }
  // The token is shown once, here; the database keeps only its hash.
  return { id, url, path: `/share/${token}`, expires_at: expires };
}

export async function revokeLink(db: Knex, user: SignedInUser, linkId: number) {
  const l = await findShareLink(db, user.labId, linkId);
  if (!l) throw new AppError({ code: "not_found", message: `There is no share link ${linkId} in this lab.` });
  if (l.revoked_at) return { revoked_at: l.revoked_at };
  const at = new Date().toISOString();
  // The open-link check is the UPDATE's own condition: of two revocations at once, one writes and audits.
  const revoked = await db.transaction(async (trx) => {
    if (!(await revokeShareLink(trx, linkId, user.userId, at))) return false;
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: "share.revoked", objectType: l.object_type, objectId: l.object_id, newValues: { share_link_id: linkId } });
    return true;
  });
  if (!revoked) return { revoked_at: (await findShareLink(db, user.labId, linkId))!.revoked_at! };
  return { revoked_at: at };
}

function refuseIfOver(l: { revoked_at: string | null; expires_at: string }, now: Date): void {
  if (l.revoked_at) throw new AppError({ code: "gone", message: `This share link was revoked on ${l.revoked_at.slice(0, 16).replace("T", " ")} UTC. Ask the sender for a new one.` });
  if (Date.parse(l.expires_at) <= now.getTime()) throw new AppError({ code: "gone", message: `This share link expired on ${l.expires_at.slice(0, 16).replace("T", " ")} UTC. Ask the sender for a new one.` });
}

/** Opens a link for a signed-in member of its lab: the pinned version's id, or a plain 410 when it is over. */
export async function openShareLink(db: Knex, user: SignedInUser, token: string, now = new Date()) {
  const l = await findShareLinkByTokenHash(db, tokenHash(token));
  if (!l || l.lab_id !== user.labId) throw new AppError({ code: "not_found", message: "This share link does not exist, or belongs to another lab." });
  refuseIfOver(l, now);
  const at = now.toISOString();
  await db.transaction(async (trx) => {
    await insertShareView(trx, l.id, user.userId, at);
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: "share.viewed", objectType: l.object_type, objectId: l.object_id, newValues: { share_link_id: l.id } });
  });
  return { object_type: l.object_type as SharedObject, fit_id: l.object_id, expires_at: l.expires_at, recipient: l.recipient };
}

/**
 * Opens a link without an account, for an outside reviewer: only where the link's lab allows outside reviewers (Lab
 * settings); read-only, the one pinned version. Each opening is an audit event naming the link and its recipient.
 * Where the lab does not allow it, the answer is 401: sign in as a member.
 */
export async function openShareLinkOutside(db: Knex, token: string, now = new Date()) {
  const l = await findShareLinkByTokenHash(db, tokenHash(token));
  if (!l) throw new AppError({ code: "not_found", message: "This share link does not exist." });
  if (!(await getLabSettings(db, l.lab_id)).outside_links) throw new AppError({ code: "unauthorized", message: "Sign in to open this link: its lab shares records with its members only." });
  refuseIfOver(l, now);
  // One row, and recordAudit appends it in its own transaction.
  await recordAudit(db, { labId: l.lab_id, actorUserId: null, actorLabel: `outside reviewer via link ${l.id}${l.recipient ? ` (${l.recipient})` : ""}`, action: "share.viewed_outside", objectType: l.object_type, objectId: l.object_id, newValues: { share_link_id: l.id } });
  const lab = await findLabById(db, l.lab_id);
  return { object_type: l.object_type as SharedObject, fit_id: l.object_id, lab_id: l.lab_id, lab_name: lab?.name ?? "", expires_at: l.expires_at, recipient: l.recipient };
}

export async function listShareLinks(db: Knex, labId: number, fitId: number, type: SharedObject = "fit") {
  // Another lab's record answers 404, as it would when opened: an empty list would say it exists.
  await sharedVersion(db, labId, type, fitId);
  return (await shareLinksOf(db, labId, type, fitId)).map((r) => ({ ...r, views: Number((r as { views: unknown }).views) }));
}
