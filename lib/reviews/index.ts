// Review and sign-off of record versions (fits and studies, through one path): draft → submitted → approved | rejected
// (reason required), withdrawal with a reason, electronic signatures that re-ask the password and bind to the
// version's content hash (21 CFR 11.50, 11.70, 11.200), comments, and the reviewer's queue. Every act is audited in
// its own transaction.
import type { Knex } from "knex";
import { getFit, latestVersion } from "@/db/queries/fits";
import { commentsOf, findCommentOn, insertComment, insertReviewEvent, insertSignature, moveReviewState, reviewEventsOf, signaturesOf, submittedFits, submittedStudies } from "@/db/queries/reviews";
import { getStudy, listStudyVersions } from "@/db/queries/studies";
import { findUserById, listLabMembers } from "@/db/queries/users";
import { appUrl, linkMail, sendMail } from "@/lib/mail";
import { createShareLink } from "@/lib/sharing";
import { recordAudit } from "@/lib/audit";
import { checkAccountPassword } from "@/lib/auth/sign-in";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { can, canReview } from "@/lib/permissions";

export type Meaning = "authored" | "reviewed" | "approved";
export type ReviewState = "draft" | "submitted" | "approved" | "rejected" | "withdrawn";

/** The kinds of record that go through review. */
export type ReviewObject = "fit" | "study";

/** What review needs of a record version, whichever kind it is. */
interface Reviewable {
  type: ReviewObject;
  id: number;
  record_id: number;
  version: number;
  title: string;
  author_id: number | null;
  content_hash: string;
  /** The page of this version, for mail. */
  path: string;
}

const NOUN: Record<ReviewObject, string> = { fit: "fit", study: "study" };

async function reviewable(db: Knex, labId: number, type: ReviewObject, id: number): Promise<Reviewable> {
  if (type === "fit") {
    const f = await getFit(db, labId, id);
    if (!f) throw new AppError({ code: "not_found", message: `There is no fit ${id} in this lab.` });
    return { type, id: f.id, record_id: f.record_id!, version: f.version, title: f.title, author_id: f.author_id, content_hash: f.content_hash, path: `/fits/${f.id}` };
  }
  const st = await getStudy(db, labId, id);
  if (!st) throw new AppError({ code: "not_found", message: `There is no study ${id} in this lab.` });
  return { type, id: st.id, record_id: st.record_id ?? st.id, version: st.version, title: st.name, author_id: st.author_id, content_hash: st.content_hash, path: `/studies/${st.id}` };
}

async function newestOf(db: Knex, r: Reviewable, labId: number): Promise<{ id: number; version: number } | null> {
  if (r.type === "fit") return (await latestVersion(db, labId, r.record_id)) ?? null;
  return (await listStudyVersions(db, labId, r.record_id)).at(-1) ?? null;
}

export async function reviewStatus(db: Knex, labId: number, id: number, type: ReviewObject = "fit") {
  const f = await reviewable(db, labId, type, id);
  const events = await reviewEventsOf(db, labId, type, id);
  const signatures = await signaturesOf(db, labId, type, id);
  const newest = await newestOf(db, f, labId);
  const last = events.at(-1);
  const state: ReviewState = last ? (last.state as ReviewState) : "draft";
  return {
    object_type: type,
    fit_id: id,
    version: f.version,
    author_id: f.author_id,
    state,
    superseded_by: newest && newest.id !== f.id ? { id: newest.id, version: newest.version } : null,
    events: events.map((e) => ({ state: e.state, actor: e.actor_name as string, reason: e.reason, at: e.at })),
    signatures: signatures.map((s) => ({
      id: s.id,
      printed_name: s.printed_name,
      meaning: s.meaning,
      signed_at: s.signed_at,
      content_hash: s.content_hash,
      // A signature binds one exact version: if its hash no longer matches, it is void.
      void: s.content_hash !== f.content_hash,
    })),
  };
}
export type ReviewStatus = Awaited<ReturnType<typeof reviewStatus>>;

/** Signing asks for the password again (21 CFR 11.200); a wrong one is refused, audited and counts toward the lockout. */
export async function checkPassword(db: Knex, user: SignedInUser, password: string, act: string, objectId: number, objectType = "fit") {
  const row = await findUserById(db, user.userId);
  if (!row) throw new AppError({ code: "unauthorized", message: "The password is not right: the signature was not made." });
  try {
    await checkAccountPassword(db, { id: row.id, password_hash: row.password_hash, labId: user.labId }, password, "signature");
  } catch (e) {
    if (e instanceof AppError)
      await recordAudit(db, { labId: user.labId, actorUserId: user.userId, action: "signature.refused", objectType, objectId, reason: e.code === "locked" ? `account locked when signing: ${act}` : `wrong password when signing: ${act}` });
    throw e;
  }
}

/** The state check that guards a decision, inside the transaction that writes it: of two concurrent decisions on one
 * version exactly one moves the state; the other gets 409 and nothing of it is written. */
async function moveOrConflict(trx: Knex.Transaction, labId: number, r: Reviewable, from: readonly ReviewState[], to: ReviewState): Promise<void> {
  if (!(await moveReviewState(trx, labId, r.type, r.id, from, to)))
    throw new AppError({ code: "conflict", message: `Someone else acted on this version at the same time: it is no longer ${from.join(" or ")}. Reload the page to see its state.` });
}

async function sign(trx: Knex.Transaction, user: SignedInUser, r: Reviewable, meaning: Meaning, at: string) {
  return insertSignature(trx, { lab_id: user.labId, object_type: r.type, object_id: r.id, user_id: user.userId, printed_name: user.name, meaning, content_hash: r.content_hash, signed_at: at });
}

export async function submitFit(db: Knex, user: SignedInUser, fitId: number, password: string) {
  return submitRecord(db, user, "fit", fitId, password);
}

export async function submitRecord(db: Knex, user: SignedInUser, type: ReviewObject, id: number, password: string) {
  if (!can(user, type === "fit" ? "fit:submit" : "study:write")) throw new AppError({ code: "forbidden", message: "Your role does not submit records for review." });
  const f = await reviewable(db, user.labId, type, id);
  const status = await reviewStatus(db, user.labId, id, type);
  if (status.superseded_by) throw new AppError({ code: "conflict", message: `Version ${f.version} has been superseded by version ${status.superseded_by.version}; submit the newest.` });
  if (status.state === "submitted" || status.state === "approved") throw new AppError({ code: "conflict", message: `This version is already ${status.state}.` });
  if (status.state === "rejected") throw new AppError({ code: "conflict", message: `A rejected version stays rejected: change the ${NOUN[type]} (a new version) and submit that.` });
  await checkPassword(db, user, password, "submit", id, type);
  const at = new Date().toISOString();
  const result = await db.transaction(async (trx) => {
    await moveOrConflict(trx, user.labId, f, ["draft", "withdrawn"], "submitted");
    const newest = await newestOf(trx, f, user.labId);
    if (newest && newest.id !== f.id) throw new AppError({ code: "conflict", message: `Version ${f.version} has been superseded by version ${newest.version}; submit the newest.` });
    const sig = await sign(trx, user, f, "authored", at);
    await insertReviewEvent(trx, { lab_id: user.labId, object_type: type, object_id: id, state: "submitted", actor_id: user.userId, signature_id: sig, reason: null, at });
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: `${type}.submitted`, objectType: type, objectId: f.record_id, objectVersion: f.version, oldValues: { state: status.state }, newValues: { state: "submitted", signature: { meaning: "authored", content_hash: f.content_hash } } });
    return { state: "submitted" as const, signature_id: sig };
  });
  // After the commit: each reviewer (never the author) is told by e-mail; for a fit, with a share link pinned to this
  // version; for a study, with the link to its page.
  const reviewers = (await listLabMembers(db, user.labId)).filter((m) => m.role === "reviewer" && m.user_id !== f.author_id && !m.disabled);
  const lines = [`${user.name} submitted version ${f.version} of "${f.title}" for review and signed it as author.`, "Open the link to comment, approve or reject (your password is asked again to sign)."];
  for (const r of reviewers) {
    if (type === "fit") await createShareLink(db, user, id, { recipient: r.email, mail: { subject: `Review requested: ${f.title} (version ${f.version})`, lines } });
    else await sendMail(linkMail([r.email], `Review requested: study ${f.title} (version ${f.version})`, lines, appUrl(f.path)));
  }
  return result;
}

export async function decideFit(db: Knex, user: SignedInUser, fitId: number, input: { decision: "approved" | "rejected"; password: string; meaning?: Meaning; reason?: string }) {
  return decideRecord(db, user, "fit", fitId, input);
}

export async function decideRecord(db: Knex, user: SignedInUser, type: ReviewObject, id: number, input: { decision: "approved" | "rejected"; password: string; meaning?: Meaning; reason?: string }) {
  if (!can(user, "review:decide")) throw new AppError({ code: "forbidden", message: "Only reviewers approve or reject records." });
  const f = await reviewable(db, user.labId, type, id);
  if (!canReview(user, { authorId: f.author_id ?? -1 })) throw new AppError({ code: "forbidden", message: "You authored this record: someone else must review it." });
  const status = await reviewStatus(db, user.labId, id, type);
  if (status.state !== "submitted") throw new AppError({ code: "conflict", message: `Only a submitted version can be approved or rejected; this one is ${status.state}.` });
  if (input.decision === "rejected" && !input.reason?.trim()) throw new AppError({ code: "unprocessable", message: "Say why the record is rejected (a reason is required).", issues: [{ path: "reason", message: "Required to reject." }] });
  await checkPassword(db, user, input.password, input.decision, id, type);
  const meaning: Meaning = input.meaning ?? (input.decision === "approved" ? "approved" : "reviewed");
  const at = new Date().toISOString();
  const decided = await db.transaction(async (trx) => {
    await moveOrConflict(trx, user.labId, f, ["submitted"], input.decision);
    const sig = await sign(trx, user, f, meaning, at);
    await insertReviewEvent(trx, { lab_id: user.labId, object_type: type, object_id: id, state: input.decision, actor_id: user.userId, signature_id: sig, reason: input.reason ?? null, at });
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: `${type}.${input.decision}`, objectType: type, objectId: f.record_id, objectVersion: f.version, oldValues: { state: "submitted" }, newValues: { state: input.decision, signature: { meaning, content_hash: f.content_hash } }, reason: input.reason ?? null });
    return { state: input.decision, signature_id: sig };
  });
  const author = f.author_id ? await findUserById(db, f.author_id) : undefined;
  if (author)
    await sendMail(linkMail([author.email], `${input.decision === "approved" ? "Approved" : "Rejected"}: ${f.title} (version ${f.version})`, [`${user.name} ${input.decision} version ${f.version} of "${f.title}" and signed (${meaning}).`, ...(input.reason ? [`Reason: ${input.reason}`] : [])], appUrl(f.path)));
  return decided;
}

export async function withdrawFit(db: Knex, user: SignedInUser, fitId: number, reason: string) {
  return withdrawRecord(db, user, "fit", fitId, reason);
}

export async function withdrawRecord(db: Knex, user: SignedInUser, type: ReviewObject, id: number, reason: string) {
  const f = await reviewable(db, user.labId, type, id);
  if (f.author_id !== user.userId) throw new AppError({ code: "forbidden", message: "Only the author withdraws a submission." });
  const status = await reviewStatus(db, user.labId, id, type);
  if (status.state !== "submitted") throw new AppError({ code: "conflict", message: `Only a submitted version can be withdrawn; this one is ${status.state}.` });
  if (!reason.trim()) throw new AppError({ code: "unprocessable", message: "Say why the submission is withdrawn." });
  const at = new Date().toISOString();
  return db.transaction(async (trx) => {
    await moveOrConflict(trx, user.labId, f, ["submitted"], "withdrawn");
    await insertReviewEvent(trx, { lab_id: user.labId, object_type: type, object_id: id, state: "withdrawn", actor_id: user.userId, signature_id: null, reason, at });
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: `${type}.withdrawn`, objectType: type, objectId: f.record_id, objectVersion: f.version, oldValues: { state: "submitted" }, newValues: { state: "withdrawn" }, reason });
    return { state: "withdrawn" as const };
  });
}

export async function addComment(db: Knex, user: SignedInUser, id: number, body: string, parentId?: number, type: ReviewObject = "fit") {
  const f = await reviewable(db, user.labId, type, id);
  const mayComment = can(user, "review:comment") || f.author_id === user.userId || can(user, type === "fit" ? "fit:write" : "study:write");
  if (!mayComment) throw new AppError({ code: "forbidden", message: "Your role does not comment on records." });
  // A reply answers a comment on this same version, in this lab; any other id answers 404 (never "exists elsewhere").
  if (parentId !== undefined && !(await findCommentOn(db, user.labId, type, id, parentId)))
    throw new AppError({ code: "not_found", message: `There is no comment ${parentId} on this version to reply to.` });
  const added = await db.transaction(async (trx) => {
    const cid = await insertComment(trx, { lab_id: user.labId, object_type: type, object_id: id, parent_id: parentId ?? null, author_id: user.userId, body, created_at: new Date().toISOString() });
    await recordAudit(trx, { labId: user.labId, actorUserId: user.userId, action: "comment.added", objectType: type, objectId: f.record_id, objectVersion: f.version, newValues: { comment_id: cid, parent_id: parentId ?? null, body } });
    return { id: cid };
  });
  if (f.author_id && f.author_id !== user.userId) {
    const author = await findUserById(db, f.author_id);
    if (author) await sendMail(linkMail([author.email], `Comment on ${f.title} (version ${f.version})`, [`${user.name} commented: ${body.slice(0, 500)}`], appUrl(f.path)));
  }
  return added;
}

export async function listComments(db: Knex, labId: number, id: number, type: ReviewObject = "fit") {
  await reviewable(db, labId, type, id);
  const rows = await commentsOf(db, labId, type, [id]);
  return rows.map((c) => ({ id: c.id, parent_id: c.parent_id, author: c.author_name as string, body: c.body, created_at: c.created_at }));
}

/** How many submitted records (fits and studies) wait for this user's decision (not their own), for the navigation. */
export async function waitingForMe(db: Knex, user: Pick<SignedInUser, "labId" | "userId">): Promise<number> {
  return (await reviewQueue(db, user.labId)).filter((r) => r.author_id !== user.userId).length;
}

/** Submitted fits and studies, oldest first, with their age. */
export async function reviewQueue(db: Knex, labId: number, now = new Date()) {
  const fits = (await submittedFits(db, labId)).map((r) => ({ object_type: "fit" as const, ...r }));
  const studies = (await submittedStudies(db, labId)).map((r) => ({ object_type: "study" as const, ...r }));
  return [...fits, ...studies]
    .sort((a, b) => a.submitted_at.localeCompare(b.submitted_at))
    .map((r) => ({ ...r, age_hours: (now.getTime() - Date.parse(r.submitted_at)) / 3.6e6 }));
}
