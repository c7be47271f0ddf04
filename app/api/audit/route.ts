import { attachment } from "@/lib/http/download";
import { auditCsv, listAuditTrail } from "@/lib/audit";
import { csvCell } from "@/lib/fits";
import { withUser } from "@/lib/http/with-user";
import { auditQuerySchema } from "@/lib/schemas/audit";

export const GET = withUser({ permission: "audit:read" }, async ({ req, db, user }) => {
  const q = auditQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const events = await listAuditTrail(db, user.labId, q);
  if (q.format === "csv")
    return new Response(auditCsv(events, csvCell), { headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": attachment("audit-trail.csv") } });
  return { events };
});
