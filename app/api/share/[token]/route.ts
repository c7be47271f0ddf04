import { z } from "zod";
import { clientAddress, takeOrRefuse } from "@/lib/http/rate-limit";
import { withUser } from "@/lib/http/with-user";
import { openShareLink } from "@/lib/sharing";

const token = z.string().regex(/^[A-Za-z0-9_-]{20,64}$/, "That is not a share link token.");

// Opening a link (logged): the pinned version's id, or 410 with a plain message when it was revoked or has expired.
export const GET = withUser<{ token: string }>({ permission: "self:read" }, async ({ req, params, db, user }) => {
  await takeOrRefuse(db, "shareByAddress", `address ${clientAddress(req.headers)}`, user.labId);
  return openShareLink(db, user, token.parse(params.token));
});
