import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";
import { getValidationRecord } from "@/lib/validation/records";

export const GET = withUser<{ id: string }>({ permission: "validation:run" }, async ({ params, db, user }) => getValidationRecord(db, user.labId, idParam.parse(params.id)));
