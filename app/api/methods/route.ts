import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { createMethod, listMethods } from "@/lib/methods";
import { createMethodSchema, listQuerySchema } from "@/lib/schemas/methods";

export const GET = withUser({ permission: "method:read" }, async ({ req, db, user }) => listMethods(db, user.labId, listQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams))));

export const POST = withUser({ permission: "method:write" }, async ({ req, db, user }) =>
  Response.json(await createMethod(db, user, createMethodSchema.parse(await jsonBody(req)).definition), { status: 201 }),
);
