import { listMembers } from "@/lib/admin/members";
import { withUser } from "@/lib/http/with-user";

export const GET = withUser({ permission: "user:manage" }, async ({ db, user }) => ({
  members: await listMembers(db, user.labId),
}));
