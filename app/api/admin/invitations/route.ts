import { inviteUser, listInvitations } from "@/lib/admin/invitations";
import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { inviteSchema } from "@/lib/schemas/admin";

export const GET = withUser({ permission: "user:manage" }, async ({ db, user }) => ({ invitations: await listInvitations(db, user.labId) }));

export const POST = withUser({ permission: "user:manage" }, async ({ req, db, user }) => {
  const { path: _secret, ...out } = await inviteUser(db, user, inviteSchema.parse(await jsonBody(req)));
  // The link goes only to the invitee's mailbox, never back to the browser.
  return Response.json(out, { status: 201 });
});
