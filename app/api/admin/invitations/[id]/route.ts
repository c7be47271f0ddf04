import { revokeInvitation } from "@/lib/admin/invitations";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";

export const DELETE = withUser<{ id: string }>({ permission: "user:manage" }, async ({ params, db, user }) => revokeInvitation(db, user, idParam.parse(params.id)));
