import { jsonBody } from "@/lib/http/json-body";
import { listFits, saveFit } from "@/lib/fits";
import { withUser } from "@/lib/http/with-user";
import { fitListQuerySchema, saveFitSchema } from "@/lib/schemas/fits";

export const GET = withUser({ permission: "fit:read" }, async ({ req, db, user }) =>
  listFits(db, user.labId, fitListQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams))),
);

// The server re-runs the fit from the stored series and the options; the client's numbers are never stored.
export const POST = withUser({ permission: "fit:write" }, async ({ req, db, user }) => {
  const body = await jsonBody(req);
  const saved = await saveFit(db, user, saveFitSchema.parse(body));
  return Response.json(saved, { status: saved.unchanged ? 200 : 201 });
});
