import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { addComment, listComments } from "@/lib/reviews";
import { idParam } from "@/lib/schemas/common";
import { commentSchema } from "@/lib/schemas/reviews";

export const GET = withUser<{ id: string }>({ permission: "study:read" }, async ({ params, db, user }) => ({ comments: await listComments(db, user.labId, idParam.parse(params.id), "study") }));

// Reviewers and the study's author comment; the service checks which.
export const POST = withUser<{ id: string }>({ permission: "study:read" }, async ({ req, params, db, user }) => {
  const { body, parentId } = commentSchema.parse(await jsonBody(req));
  return Response.json(await addComment(db, user, idParam.parse(params.id), body, parentId, "study"), { status: 201 });
});
