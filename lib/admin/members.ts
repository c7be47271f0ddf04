// Lab membership administration.
import type { Db } from "@/db";
import { listLabMembers } from "@/db/queries/users";
import type { Member } from "@/lib/schemas/members";

export async function listMembers(db: Db, labId: number): Promise<Member[]> {
  return (await listLabMembers(db, labId)).map((r) => ({
    userId: r.user_id,
    email: r.email,
    name: r.display_name,
    role: r.role,
    disabled: Boolean(r.disabled),
    lockedUntil: r.locked_until,
    failedSignIns: r.failed_sign_ins,
  }));
}
