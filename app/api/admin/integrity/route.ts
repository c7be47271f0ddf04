import { checkLabIntegrity } from "@/lib/integrity";
import { withUser } from "@/lib/http/with-user";

// The lab administrator's integrity check: the audit trail (chain, MACs, head) and every record version recomputed.
export const POST = withUser({ permission: "audit:read" }, async ({ db, user }) => checkLabIntegrity(db, user));
