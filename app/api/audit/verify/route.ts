import { verifyAuditTrail } from "@/lib/audit";
import { withUser } from "@/lib/http/with-user";

// Recomputes the whole trail (hash chain, MACs under the audit key, the head); names the first row that does not match.
export const GET = withUser({ permission: "audit:read" }, async ({ db }) => verifyAuditTrail(db));
