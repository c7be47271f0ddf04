// Lab membership administration.
import type { Db } from "@/db";
import type { PageQuery } from "@/db/queries/paging";
import { clearFailedSignIns, endSessions, findUserById, listLabMembers, listMembershipsOfUser, pageLabMembers, setMembershipRole, setUserDisabled, type LabMemberRow } from "@/db/queries/users";
import type { Knex } from "knex";
import { recordAudit } from "@/lib/audit";
import type { SignedInUser } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import type { Member, MemberAction } from "@/lib/schemas/members";

function memberOf(r: LabMemberRow): Member {
  return {
    userId: r.user_id,
    email: r.email,
    name: r.display_name,
    role: r.role,
    disabled: Boolean(r.disabled),
    lockedUntil: r.locked_until,
    failedSignIns: r.failed_sign_ins,
  };
}

export async function listMembers(db: Db, labId: number): Promise<Member[]> {
  return (await listLabMembers(db, labId)).map(memberOf);
}

/** One page of members for the admin list (sorted, filtered and paged on the server). */
export async function pageMembers(db: Db, labId: number, q: PageQuery) {
  const { rows, total } = await pageLabMembers(db, labId, q);
  return { rows: rows.map((r) => ({ ...memberOf(r), since: r.since })), total };
}

/** Unlock, deactivate (never delete: records stay attributed), reactivate, or change a role; each audited with a reason. */
export async function changeMember(db: Knex, admin: SignedInUser, userId: number, change: MemberAction) {
  const membership = (await listMembershipsOfUser(db, userId)).find((m) => m.lab_id === admin.labId);
  const user = await findUserById(db, userId);
  if (!membership || !user) throw new AppError({ code: "not_found", message: `There is no member ${userId} in this lab.` });
  if (userId === admin.userId && change.action !== "unlock")
    throw new AppError({ code: "conflict", message: "You cannot change your own account or role; ask another administrator." });
  return db.transaction(async (trx) => {
    let oldValues: unknown, newValues: unknown;
    if (change.action === "unlock") {
      oldValues = { locked_until: user.locked_until, failed_sign_ins: user.failed_sign_ins };
      await clearFailedSignIns(trx, userId);
      newValues = { locked_until: null, failed_sign_ins: 0 };
    } else if (change.action === "deactivate" || change.action === "reactivate") {
      oldValues = { disabled: Boolean(user.disabled) };
      await setUserDisabled(trx, userId, change.action === "deactivate");
      await endSessions(trx, userId);
      newValues = { disabled: change.action === "deactivate" };
    } else {
      oldValues = { role: membership.role };
      await setMembershipRole(trx, userId, admin.labId, change.role);
      await endSessions(trx, userId);
      newValues = { role: change.role };
    }
    await recordAudit(trx, { labId: admin.labId, actorUserId: admin.userId, action: `member.${change.action === "role" ? "role_changed" : change.action}`, objectType: "user", objectId: userId, oldValues, newValues, reason: change.reason });
    return { ok: true as const };
  });
}
