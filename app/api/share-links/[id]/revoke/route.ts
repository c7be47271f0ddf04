import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";
import { revokeLink } from "@/lib/sharing";

export const POST = withUser<{ id: string }>({ permission: "share:revoke" }, async ({ params, db, user }) => revokeLink(db, user, idParam.parse(params.id)));
