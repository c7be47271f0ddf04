import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { createStudySchema } from "@/lib/schemas/studies";
import { createStudy, listStudies } from "@/lib/studies";

export const GET = withUser({ permission: "study:read" }, async ({ db, user }) => ({ studies: await listStudies(db, user.labId) }));

export const POST = withUser({ permission: "study:write" }, async ({ req, db, user }) => {
  const body = await jsonBody(req);
  return Response.json(await createStudy(db, user, createStudySchema.parse(body)), { status: 201 });
});
