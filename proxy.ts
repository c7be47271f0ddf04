// Redirects signed-out page requests to sign-in. Nothing more: every page, route handler and action checks
// the session and the permission itself.
import { NextResponse, type NextRequest } from "next/server";

const SESSION_COOKIES = ["next-auth.session-token", "__Secure-next-auth.session-token"];

export function proxy(req: NextRequest) {
  const hasSession = SESSION_COOKIES.some((c) => req.cookies.has(c));
  if (hasSession) return NextResponse.next();
  const url = req.nextUrl.clone();
  url.pathname = "/sign-in";
  url.search = `?next=${encodeURIComponent(req.nextUrl.pathname + req.nextUrl.search)}`;
  return NextResponse.redirect(url);
}

export const config = {
  // Pages only: the API answers 401 itself; sign-in, invitation and share links (which check for themselves), assets
  // and fonts stay open.
  matcher: ["/((?!api|sign-in|invite|share|_next|favicon.ico|fonts).*)"],
};
