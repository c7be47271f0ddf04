// Checks an e-mail and password, counting failures and locking the account after too many in a row (21 CFR 11.300).
import type { Knex } from "knex";
import type { Db } from "@/db";
import { findUserByEmail, listMembershipsOfUser, lockAccount, reservePasswordAttempt, settlePasswordSuccess } from "@/db/queries/users";
import { recordAudit } from "@/lib/audit";
import { AppError } from "@/lib/errors";
import { takeOrRefuse } from "@/lib/http/rate-limit";
import type { Role } from "@/lib/permissions/roles";
import { DUMMY_HASH, verifyPassword } from "./password";

export const MAX_FAILED_SIGN_INS = 5;
export const LOCKOUT_MINUTES = 15;

export interface SignedInUser {
  userId: number;
  email: string;
  name: string;
  labId: number;
  labSlug: string;
  labName: string;
  role: Role;
  /** The session version this sign-in was issued under (see users.session_version). */
  sessionVersion?: number;
}

/**
 * Every refused sign-in gets these words, whether the e-mail has an account, is disabled, has a wrong password or is
 * locked: the answer never tells an outsider which e-mails exist. The lockout is said in general terms.
 */
export const WRONG_CREDENTIALS = `The e-mail or password is not right, or sign-in is paused after ${MAX_FAILED_SIGN_INS} failed attempts in a row (for ${LOCKOUT_MINUTES} minutes). Check both and try again, or ask a lab administrator.`;

function hhmm(iso: string): string {
  return iso.slice(11, 16) + " UTC";
}

/**
 * Signs in with an e-mail and password. Given the client's address (every sign-in form and endpoint gives it), the
 * attempt is first counted against the address's and the e-mail's rate limits (429 past either, shared by every
 * server process through the database).
 */
export async function signInWithPassword(
  db: Knex,
  email: string,
  password: string,
  now: Date = new Date(),
  client?: { address: string },
): Promise<SignedInUser> {
  if (client) {
    await takeOrRefuse(db, "signInByAddress", `address ${client.address}`);
    await takeOrRefuse(db, "signInByAccount", `e-mail ${email.trim().toLowerCase().slice(0, 254)}`);
  }
  const user = await findUserByEmail(db, email);
  if (!user || user.disabled) {
    await verifyPassword(password, DUMMY_HASH);
    await recordAudit(db, {
      labId: null,
      actorUserId: null,
      actorLabel: email.slice(0, 254),
      action: "auth.sign_in_failed",
      reason: user ? "account disabled" : "unknown e-mail",
    }, now);
    throw new AppError({ code: "unauthorized", message: WRONG_CREDENTIALS });
  }
  const memberships = await listMembershipsOfUser(db, user.id);
  const home = memberships[0];
  const labId = home?.lab_id ?? null;
  try {
    await checkAccountPassword(db, { id: user.id, password_hash: user.password_hash, labId }, password, "sign-in", now);
  } catch (e) {
    // Wrong, locked or locked now: one answer (the audit trail keeps which).
    if (e instanceof AppError && (e.code === "unauthorized" || e.code === "locked")) throw new AppError({ code: "unauthorized", message: WRONG_CREDENTIALS });
    throw e;
  }

  if (!home) {
    throw new AppError({ code: "forbidden", message: "This account belongs to no lab yet. Ask a lab administrator to add you." });
  }
  await recordAudit(db, { labId: home.lab_id, actorUserId: user.id, action: "auth.signed_in" }, now);
  return {
    userId: user.id,
    email: user.email,
    name: user.display_name,
    labId: home.lab_id,
    labSlug: home.lab_slug,
    labName: home.lab_name,
    role: home.role,
    sessionVersion: user.session_version,
  };
}

/**
 * The one password check for sign-in and for signatures (21 CFR 11.300(d)): every attempt is counted before the
 * password is compared, atomically, so parallel guesses cannot outrun the limit; while the account is locked no
 * password is compared at all; a right password counts only if no lock was set while it was checked. Wrong signing
 * passwords count toward the same lockout. Throws AppError "unauthorized" or "locked".
 */
export async function checkAccountPassword(
  db: Db,
  user: { id: number; password_hash: string; labId: number | null },
  password: string,
  context: "sign-in" | "signature",
  now: Date = new Date(),
): Promise<void> {
  const { count, lockedUntil } = await reservePasswordAttempt(db, user.id, now.toISOString());
  const lockedMessage = (until: string) =>
    `This account is locked after ${MAX_FAILED_SIGN_INS} failed ${context === "sign-in" ? "sign-ins" : "password entries"} in a row. Try again after ${hhmm(until)}, or ask a lab administrator.`;
  if (lockedUntil || count > MAX_FAILED_SIGN_INS) {
    // Locked, or past the limit by parallel attempts: refused without comparing the password (at sign-in a dummy hash
    // is compared instead, so a locked account answers as slowly as any other).
    if (context === "sign-in") await verifyPassword(password, DUMMY_HASH);
    const until = lockedUntil ?? new Date(now.getTime() + LOCKOUT_MINUTES * 60_000).toISOString();
    if (!lockedUntil && (await lockAccount(db, user.id, until)))
      await recordAudit(db, { labId: user.labId, actorUserId: user.id, action: "auth.account_locked", newValues: { locked_until: until }, reason: `${count} password attempts in a row without success` }, now);
    await recordAudit(db, { labId: user.labId, actorUserId: user.id, action: context === "sign-in" ? "auth.sign_in_refused_locked" : "auth.password_refused_locked", reason: `locked until ${until}` }, now);
    throw new AppError({ code: "locked", message: lockedMessage(until) });
  }
  const ok = await verifyPassword(password, user.password_hash);
  if (ok) {
    if (await settlePasswordSuccess(db, user.id, MAX_FAILED_SIGN_INS)) return;
    // Locked by other attempts while this one was checked.
    await recordAudit(db, { labId: user.labId, actorUserId: user.id, action: context === "sign-in" ? "auth.sign_in_refused_locked" : "auth.password_refused_locked", reason: "locked while the password was checked" }, now);
    throw new AppError({ code: "locked", message: lockedMessage(new Date(now.getTime() + LOCKOUT_MINUTES * 60_000).toISOString()) });
  }
  await recordAudit(db, { labId: user.labId, actorUserId: user.id, action: context === "sign-in" ? "auth.sign_in_failed" : "auth.password_failed", reason: `wrong password (${count} in a row)` }, now);
  if (count >= MAX_FAILED_SIGN_INS) {
    const until = new Date(now.getTime() + LOCKOUT_MINUTES * 60_000).toISOString();
    if (await lockAccount(db, user.id, until))
      await recordAudit(db, { labId: user.labId, actorUserId: user.id, action: "auth.account_locked", newValues: { locked_until: until }, reason: `${count} failed password entries in a row` }, now);
    throw new AppError({
      code: "locked",
      message: `The password is not right. After ${MAX_FAILED_SIGN_INS} failed ${context === "sign-in" ? "sign-ins" : "password entries"} in a row this account is locked for ${LOCKOUT_MINUTES} minutes, until ${hhmm(until)}.`,
    });
  }
  throw new AppError({ code: "unauthorized", message: context === "sign-in" ? WRONG_CREDENTIALS : "The password is not right: the signature was not made." });
}
