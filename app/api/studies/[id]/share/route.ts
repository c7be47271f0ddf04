import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";
import { createShareSchema } from "@/lib/schemas/sharing";
import { createShareLink, listShareLinks } from "@/lib/sharing";

// Share links to one study version, as for fits.
export const GET = withUser<{ id: string }>({ permission: "share:create" }, async ({ params, db, user }) => ({ links: await listShareLinks(db, user.labId, idParam.parse(params.id), "study") }));

// Answers with the link once; only its hash is kept.
export const POST = withUser<{ id: string }>({ permission: "share:create" }, async ({ req, params, db, user }) =>
  Response.json(await createShareLink(db, user, idParam.parse(params.id), { ...createShareSchema.parse(await jsonBody(req)), type: "study" }), { status: 201 }),
);
