// Page guards: signed-out visitors go to sign-in; a signed-in user without the permission gets a real 403.
import { forbidden, redirect } from "next/navigation";
import { can, type Permission } from "@/lib/permissions";
import { getSessionUser, type SignedInUser } from "./session";

export async function requirePageUser(permission?: Permission, from = "/"): Promise<SignedInUser> {
  const user = await getSessionUser();
  if (!user) redirect(`/sign-in?next=${encodeURIComponent(from)}`);
  if (permission && !can(user, permission)) forbidden();
  return user;
}
