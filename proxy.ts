// Redirects signed-out page requests to sign-in, and gives share pages their status code (410 for a link that is
// over, 404 for one that does not exist) before the page renders its message. Nothing more: every page, route
// handler and action checks the session and the permission itself.
import { NextResponse, type NextRequest } from "next/server";
import { getDb } from "@/db";
import { AppError } from "@/lib/errors";
import { clientAddress, takeOrRefuse } from "@/lib/http/rate-limit";
import { shareLinkState } from "@/lib/sharing/state";

const SESSION_COOKIES = ["next-auth.session-token", "__Secure-next-auth.session-token"];

export async function proxy(req: NextRequest) {
  const share = req.nextUrl.pathname.match(/^\/share\/([^/]+)\/?$/);
  if (share) {
    const db = await getDb();
    try {
      // Every open of a share page is a token guess when the token is wrong: counted per address.
      await takeOrRefuse(db, "shareByAddress", `address ${clientAddress(req.headers)}`);
    } catch (e) {
      if (e instanceof AppError) return new NextResponse(e.message, { status: e.status, headers: { "content-type": "text/plain; charset=utf-8", "retry-after": String(e.retryAfter ?? 60) } });
      throw e;
    }
    const state = await shareLinkState(db, decodeURIComponent(share[1]!)).catch(() => "open" as const);
    return state === "open" ? NextResponse.next() : NextResponse.next({ status: state === "gone" ? 410 : 404 });
  }
  const hasSession = SESSION_COOKIES.some((c) => req.cookies.has(c));
  if (hasSession) return NextResponse.next();
  const url = req.nextUrl.clone();
  url.pathname = "/sign-in";
  url.search = `?next=${encodeURIComponent(req.nextUrl.pathname + req.nextUrl.search)}`;
  return NextResponse.redirect(url);
}

export const config = {
  // Pages only: the API answers 401 itself; sign-in, invitation, first-run and share pages (which check for themselves), assets
  // and fonts stay open to signed-out visitors. Share pages pass through for their status code.
  matcher: ["/((?!api|sign-in|invite|first-run|share|_next|favicon.ico|icon.svg|fonts).*)", "/share/:token"],
};
