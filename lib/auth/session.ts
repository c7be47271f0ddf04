// The signed-in user of the current request, re-read from the database so a changed role or a disabled account counts at once.
import { getServerSession } from "next-auth";
import { getDb } from "@/db";
import { findUserById, listMembershipsOfUser } from "@/db/queries/users";
import { authOptions } from "./options";
import type { SignedInUser } from "./sign-in";

export type { SignedInUser } from "./sign-in";

export async function getSessionUser(): Promise<SignedInUser | null> {
  const session = (await getServerSession(authOptions)) as { uid?: number; labId?: number; sv?: number } | null;
  if (!session?.uid || !session.labId) return null;
  const db = await getDb();
  const user = await findUserById(db, session.uid);
  if (!user || user.disabled) return null;
  // Signed out, deactivated or given another role since this token was issued: the session has ended.
  if ((session.sv ?? 0) !== Number(user.session_version ?? 0)) return null;
  const m = (await listMembershipsOfUser(db, user.id)).find((x) => x.lab_id === session.labId);
  if (!m) return null;
  return {
    userId: user.id,
    email: user.email,
    name: user.display_name,
    labId: m.lab_id,
    labSlug: m.lab_slug,
    labName: m.lab_name,
    role: m.role,
  };
}
