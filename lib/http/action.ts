// The one helper for server actions: a server action is a public POST endpoint, so it authenticates and authorizes too.
import type { Knex } from "knex";
import { ZodError } from "zod";
import { getDb } from "@/db";
import { getSessionUser, type SignedInUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";
import { can, type Permission } from "@/lib/permissions";
import { toErrorBody } from "./errors";

export interface ActionState {
  ok: boolean;
  message?: string;
  fieldErrors?: Record<string, string[]>;
}

export function authedAction<I>(
  permission: Permission,
  run: (ctx: { user: SignedInUser; db: Knex; input: I }) => Promise<ActionState>,
): (prev: ActionState, input: I) => Promise<ActionState> {
  return async (_prev, input) => {
    try {
      const user = await getSessionUser();
      if (!user) throw new AppError({ code: "unauthorized", message: "Sign in first." });
      if (!can(user, permission)) throw new AppError({ code: "forbidden", message: "Your role in this lab does not allow this." });
      return await run({ user, db: await getDb(), input });
    } catch (e) {
      if (e instanceof ZodError) {
        const fieldErrors: Record<string, string[]> = {};
        for (const i of e.issues) (fieldErrors[i.path.join(".")] ??= []).push(i.message);
        return { ok: false, message: "Some fields need attention.", fieldErrors };
      }
      return { ok: false, message: toErrorBody(e).body.error.message };
    }
  };
}
