// Users and their lab memberships.
import type { Db } from "@/db";
import { pageOf, type PageQuery } from "./paging";
import type { DbMembershipRow, DbUserRow } from "@/db/tables";
import type { Role } from "@/lib/permissions/roles";

export async function insertUser(
  db: Db,
  user: { email: string; displayName: string; passwordHash: string; createdAt: string },
): Promise<DbUserRow> {
  const [row] = await db("users")
    .insert({
      email: user.email.toLowerCase(),
      display_name: user.displayName,
      password_hash: user.passwordHash,
      failed_sign_ins: 0,
      locked_until: null,
      disabled: false,
      created_at: user.createdAt,
    })
    .returning("*");
  return row as DbUserRow;
}

export async function findUserByEmail(db: Db, email: string): Promise<DbUserRow | undefined> {
  return db("users").where({ email: email.trim().toLowerCase() }).first();
}

export async function findUserById(db: Db, id: number): Promise<DbUserRow | undefined> {
  return db("users").where({ id }).first();
}

/**
 * Counts a password attempt before the password is checked, in one transaction: a lock that has run out is cleared
 * first; then the counter goes up by one. Returns the count after this attempt and the lock as it stands.
 */
export async function reservePasswordAttempt(db: Db, userId: number, nowIso: string): Promise<{ count: number; lockedUntil: string | null }> {
  const run = async (trx: Db) => {
    await trx("users").where({ id: userId }).whereNotNull("locked_until").where("locked_until", "<=", nowIso).update({ failed_sign_ins: 0, locked_until: null });
    await trx("users").where({ id: userId }).update({ failed_sign_ins: trx.raw("failed_sign_ins + 1") });
    const row = (await trx("users").where({ id: userId }).first("failed_sign_ins", "locked_until")) as { failed_sign_ins: number; locked_until: string | null } | undefined;
    return { count: Number(row?.failed_sign_ins ?? 0), lockedUntil: row?.locked_until ?? null };
  };
  return db.isTransaction ? run(db) : db.transaction(run);
}

/** Sets the lock unless one is set; true when this call set it. */
export async function lockAccount(db: Db, userId: number, until: string): Promise<boolean> {
  return (await db("users").where({ id: userId }).whereNull("locked_until").update({ locked_until: until })) === 1;
}

/** A right password: the count starts again, but only if no lock was set while it was being checked. */
export async function settlePasswordSuccess(db: Db, userId: number, maxCount: number): Promise<boolean> {
  return (await db("users").where({ id: userId }).whereNull("locked_until").where("failed_sign_ins", "<=", maxCount).update({ failed_sign_ins: 0 })) === 1;
}

export async function clearFailedSignIns(db: Db, userId: number): Promise<void> {
  await db("users").where({ id: userId }).update({ failed_sign_ins: 0, locked_until: null });
}

export async function insertMembership(
  db: Db,
  m: { userId: number; labId: number; role: Role; createdAt: string },
): Promise<DbMembershipRow> {
  const [row] = await db("memberships")
    .insert({ user_id: m.userId, lab_id: m.labId, role: m.role, created_at: m.createdAt })
    .returning("*");
  return row as DbMembershipRow;
}

export interface MembershipWithLab {
  user_id: number;
  lab_id: number;
  role: Role;
  lab_slug: string;
  lab_name: string;
}

/** The user's memberships, oldest first (the first is the lab they sign in to). */
export async function listMembershipsOfUser(db: Db, userId: number): Promise<MembershipWithLab[]> {
  return db("memberships as m")
    .join("labs as l", "l.id", "m.lab_id")
    .where("m.user_id", userId)
    .orderBy("m.id")
    .select("m.user_id", "m.lab_id", "m.role", "l.slug as lab_slug", "l.name as lab_name");
}

export interface LabMemberRow {
  user_id: number;
  email: string;
  display_name: string;
  role: Role;
  disabled: boolean | number;
  locked_until: string | null;
  failed_sign_ins: number;
}

export async function listLabMembers(db: Db, labId: number): Promise<LabMemberRow[]> {
  return db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.lab_id", labId)
    .orderBy("u.display_name")
    .select("u.id as user_id", "u.email", "u.display_name", "m.role", "u.disabled", "u.locked_until", "u.failed_sign_ins");
}

const MEMBER_SORTS: Record<string, string> = { name: "u.display_name", email: "u.email", role: "m.role", since: "m.created_at" };

/** One page of a lab's members, sorted and filtered in SQL. */
export async function pageLabMembers(db: Db, labId: number, q: PageQuery) {
  const base = db("memberships as m").join("users as u", "u.id", "m.user_id").where("m.lab_id", labId);
  if (q.q) base.andWhere((w) => w.whereLike("u.display_name", `%${q.q}%`).orWhereLike("u.email", `%${q.q}%`).orWhereLike("m.role", `%${q.q}%`));
  return pageOf<LabMemberRow & { since: string }>(base, q, { column: MEMBER_SORTS[q.sort] ?? "u.display_name", tie: "u.id" }, (b) =>
    b.select("u.id as user_id", "u.email", "u.display_name", "m.role", "u.disabled", "u.locked_until", "u.failed_sign_ins", "m.created_at as since"),
  );
}

export async function setUserDisabled(db: Db, userId: number, disabled: boolean): Promise<void> {
  await db("users").where({ id: userId }).update({ disabled });
}

export async function setMembershipRole(db: Db, userId: number, labId: number, role: Role): Promise<void> {
  await db("memberships").where({ user_id: userId, lab_id: labId }).update({ role });
}

/** Ends every session of the user: tokens carry the version they were issued under. */
export async function endSessions(db: Db, userId: number): Promise<void> {
  await db("users").where({ id: userId }).update({ session_version: db.raw("session_version + 1") });
}
