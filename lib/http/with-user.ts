// The one wrapper for route handlers: resolves params, loads the user, checks the permission, maps errors to responses.
import type { Knex } from "knex";
import { getDb } from "@/db";
import { getSessionUser, type SignedInUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";
import { can, type Permission } from "@/lib/permissions";
import { toErrorResponse } from "./errors";
import { assertSameOriginWrite } from "./guard";

export interface HandlerContext<P> {
  req: Request;
  params: P;
  user: SignedInUser;
  db: Knex;
}

type RouteContext<P> = { params: Promise<P> };

/** Handlers return a Response, or data to send as JSON with status 200. */
export function withUser<P = Record<string, never>>(
  opts: { permission: Permission },
  handler: (ctx: HandlerContext<P>) => Promise<Response | object>,
): (req: Request, ctx: RouteContext<P>) => Promise<Response> {
  return async (req, ctx) => {
    try {
      assertSameOriginWrite(req);
      const user = await getSessionUser();
      if (!user) throw new AppError({ code: "unauthorized", message: "Sign in first." });
      if (!can(user, opts.permission)) {
        throw new AppError({ code: "forbidden", message: "Your role in this lab does not allow this." });
      }
      const params = ctx?.params ? await ctx.params : ({} as P);
      const out = await handler({ req, params, user, db: await getDb() });
      return out instanceof Response ? out : Response.json(out);
    } catch (e) {
      return toErrorResponse(e);
    }
  };
}
