import { listAuditTrail } from "@/lib/audit";
import { withUser } from "@/lib/http/with-user";
import { auditQuerySchema } from "@/lib/schemas/audit";

export const GET = withUser({ permission: "audit:read" }, async ({ req, db, user }) => {
  const q = auditQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  return { events: await listAuditTrail(db, user.labId, q) };
});
