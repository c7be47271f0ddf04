import { withUser } from "@/lib/http/with-user";
import { reviewStatus } from "@/lib/reviews";
import { idParam } from "@/lib/schemas/common";

export const GET = withUser<{ id: string }>({ permission: "study:read" }, async ({ params, db, user }) => reviewStatus(db, user.labId, idParam.parse(params.id), "study"));
