import { verifyAuditChain } from "@/lib/audit";
import { withUser } from "@/lib/http/with-user";

// Recomputes the whole hash chain; names the first row that does not match.
export const GET = withUser({ permission: "audit:read" }, async ({ db }) => {
  const broken = await verifyAuditChain(db);
  return { intact: broken === null, first_broken_row: broken };
});
