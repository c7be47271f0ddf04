import { getFitRecord } from "@/lib/fits";
import { listAuditTrail } from "@/lib/audit";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";

// The audit events of one record (every version), for anyone who may read it.
export const GET = withUser<{ id: string }>({ permission: "fit:read" }, async ({ params, db, user }) => {
  const rec = await getFitRecord(db, user.labId, idParam.parse(params.id));
  return { events: await listAuditTrail(db, user.labId, { limit: 500, objectType: "fit", objectId: String(rec.record_id) }) };
});
