// Checks an e-mail and password, counting failures and locking the account after too many in a row (21 CFR 11.300).
import type { Db } from "@/db";
import { clearFailedSignIns, findUserByEmail, listMembershipsOfUser, recordFailedSignIn } from "@/db/queries/users";
import { recordAudit } from "@/lib/audit";
import { AppError } from "@/lib/errors";
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
}

export const WRONG_CREDENTIALS = "The e-mail or password is not right. Check both and try again.";

function hhmm(iso: string): string {
  return iso.slice(11, 16) + " UTC";
}

export async function signInWithPassword(
  db: Db,
  email: string,
  password: string,
  now: Date = new Date(),
): Promise<SignedInUser> {
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

  if (user.locked_until && new Date(user.locked_until) > now) {
    await verifyPassword(password, DUMMY_HASH);
    await recordAudit(db, { labId, actorUserId: user.id, action: "auth.sign_in_refused_locked", reason: `locked until ${user.locked_until}` }, now);
    throw new AppError({
      code: "locked",
      message: `This account is locked after ${MAX_FAILED_SIGN_INS} failed sign-ins in a row. Try again after ${hhmm(user.locked_until)}, or ask a lab administrator.`,
    });
  }

  const ok = await verifyPassword(password, user.password_hash);
  if (!ok) {
    // A lock that has run out starts a fresh count.
    const base = user.locked_until ? 0 : user.failed_sign_ins;
    if (user.locked_until) await clearFailedSignIns(db, user.id);
    const willLock = base + 1 >= MAX_FAILED_SIGN_INS;
    const lockedUntil = willLock ? new Date(now.getTime() + LOCKOUT_MINUTES * 60_000).toISOString() : null;
    const count = await recordFailedSignIn(db, user.id, lockedUntil);
    await recordAudit(db, { labId, actorUserId: user.id, action: "auth.sign_in_failed", reason: `wrong password (${count} in a row)` }, now);
    if (lockedUntil) {
      await recordAudit(db, { labId, actorUserId: user.id, action: "auth.account_locked", newValues: { locked_until: lockedUntil }, reason: `${count} failed sign-ins in a row` }, now);
      throw new AppError({
        code: "locked",
        message: `The password is not right. After ${MAX_FAILED_SIGN_INS} failed sign-ins in a row this account is locked for ${LOCKOUT_MINUTES} minutes, until ${hhmm(lockedUntil)}.`,
      });
    }
    throw new AppError({ code: "unauthorized", message: WRONG_CREDENTIALS });
  }

  if (!home) {
    throw new AppError({ code: "forbidden", message: "This account belongs to no lab yet. Ask a lab administrator to add you." });
  }
  if (user.failed_sign_ins > 0 || user.locked_until) await clearFailedSignIns(db, user.id);
  await recordAudit(db, { labId: home.lab_id, actorUserId: user.id, action: "auth.signed_in" }, now);
  return {
    userId: user.id,
    email: user.email,
    name: user.display_name,
    labId: home.lab_id,
    labSlug: home.lab_slug,
    labName: home.lab_name,
    role: home.role,
  };
}
