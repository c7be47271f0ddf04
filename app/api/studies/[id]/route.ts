import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";
import { changeStudySchema } from "@/lib/schemas/studies";
import { changeStudy, getStudyRecord } from "@/lib/studies";

export const GET = withUser<{ id: string }>({ permission: "study:read" }, async ({ params, db, user }) => getStudyRecord(db, user.labId, idParam.parse(params.id)));

// A change (members, temperatures, options, name) saves a new version; the reason is required.
export const POST = withUser<{ id: string }>({ permission: "study:write" }, async ({ req, params, db, user }) => {
  const body = await jsonBody(req);
  return Response.json(await changeStudy(db, user, idParam.parse(params.id), changeStudySchema.parse(body)), { status: 201 });
});
