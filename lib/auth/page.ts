// Page guards: signed-out visitors go to sign-in; a signed-in user without the permission gets a real 403.
import { forbidden, notFound, redirect } from "next/navigation";
import { AppError } from "@/lib/errors";
import { can, type Permission } from "@/lib/permissions";
import { getSessionUser, type SignedInUser } from "./session";

export async function requirePageUser(permission?: Permission, from = "/"): Promise<SignedInUser> {
  const user = await getSessionUser();
  if (!user) redirect(`/sign-in?next=${encodeURIComponent(from)}`);
  if (permission && !can(user, permission)) forbidden();
  return user;
}

/** For a page's `.catch`: a record that is not in the user's lab is the page's 404; any other failure goes on. */
export function orNotFound(e: unknown): never {
  if (e instanceof AppError && e.code === "not_found") notFound();
  throw e;
}
