import { createApiKey, listApiKeys } from "@/lib/admin/api-keys";
import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { createApiKeySchema } from "@/lib/schemas/admin";

export const GET = withUser({ permission: "user:manage" }, async ({ db, user }) => ({ keys: await listApiKeys(db, user.labId) }));

// The key is in this answer once; only its hash is stored.
export const POST = withUser({ permission: "user:manage" }, async ({ req, db, user }) =>
  Response.json(await createApiKey(db, user, createApiKeySchema.parse(await jsonBody(req)).name), { status: 201 }),
);
