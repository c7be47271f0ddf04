import { withUser } from "@/lib/http/with-user";
import { getCalibration } from "@/lib/methods";
import { idParam } from "@/lib/schemas/common";

export const GET = withUser<{ id: string }>({ permission: "method:read" }, async ({ params, db, user }) => getCalibration(db, user.labId, idParam.parse(params.id)));
