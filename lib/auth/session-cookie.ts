// Starts a next-auth session from the server (a server action), so password forms post to the server and work without
// scripts: the same JWT and cookie next-auth itself would write after its credentials callback.
import { encode } from "next-auth/jwt";
import { cookies } from "next/headers";
import { SESSION_HOURS } from "./options";
import { authSecret } from "./secret";
import type { SignedInUser } from "./sign-in";

/** next-auth 4 names its cookie with the __Secure- prefix when the site is served over https. */
export function sessionCookieName(): string {
  return `${secureCookies() ? "__Secure-" : ""}next-auth.session-token`;
}

function secureCookies(): boolean {
  return (process.env.NEXTAUTH_URL ?? "").startsWith("https://");
}

export async function startSession(u: SignedInUser): Promise<void> {
  const maxAge = SESSION_HOURS * 3600;
  const token = await encode({
    token: { sub: String(u.userId), email: u.email, name: u.name, uid: u.userId, labId: u.labId, role: u.role, sv: u.sessionVersion ?? 0 },
    secret: authSecret(),
    maxAge,
  });
  (await cookies()).set(sessionCookieName(), token, { httpOnly: true, sameSite: "lax", path: "/", secure: secureCookies(), maxAge });
}

/** Only same-site paths, so a form cannot be used to send people elsewhere. */
export function safeNext(next: unknown): string {
  return typeof next === "string" && next.startsWith("/") && !next.startsWith("//") && !next.startsWith("/\\") ? next : "/";
}
