import { getDb } from "@/db";
import { acceptInvitation } from "@/lib/admin/invitations";
import { toErrorResponse } from "@/lib/http/errors";
import { assertSameOriginWrite } from "@/lib/http/guard";
import { jsonBody } from "@/lib/http/json-body";
import { clientAddress, takeOrRefuse } from "@/lib/http/rate-limit";
import { acceptInvitationSchema } from "@/lib/schemas/admin";

// Public by design: the invitee has no account yet; the one-time token in the path is the credential.
export async function POST(req: Request, ctx: { params: Promise<{ token: string }> }): Promise<Response> {
  try {
    assertSameOriginWrite(req);
    const { token } = await ctx.params;
    const db = await getDb();
    await takeOrRefuse(db, "invitationByAddress", `address ${clientAddress(req.headers)}`);
    const { password } = acceptInvitationSchema.parse(await jsonBody(req));
    return Response.json(await acceptInvitation(db, token, password), { status: 201 });
  } catch (e) {
    return toErrorResponse(e);
  }
}
