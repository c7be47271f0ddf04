import { withUser } from "@/lib/http/with-user";
import { ALL_PERMISSIONS, can } from "@/lib/permissions";
import type { Me } from "@/lib/schemas/me";

export const GET = withUser({ permission: "self:read" }, async ({ user }): Promise<Me> => ({
  user: { id: user.userId, email: user.email, name: user.name },
  lab: { id: user.labId, slug: user.labSlug, name: user.labName },
  role: user.role,
  permissions: ALL_PERMISSIONS.filter((p) => can(user, p)),
}));
