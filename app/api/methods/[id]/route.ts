import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { getMethod, newMethodVersion } from "@/lib/methods";
import { idParam } from "@/lib/schemas/common";
import { newMethodVersionSchema } from "@/lib/schemas/methods";

export const GET = withUser<{ id: string }>({ permission: "method:read" }, async ({ params, db, user }) => getMethod(db, user.labId, idParam.parse(params.id)));

// A change makes a new version (with a reason); nothing is overwritten.
export const POST = withUser<{ id: string }>({ permission: "method:write" }, async ({ req, params, db, user }) => {
  const body = newMethodVersionSchema.parse(await jsonBody(req));
  return Response.json(await newMethodVersion(db, user, idParam.parse(params.id), body.definition, body.reason), { status: 201 });
});
