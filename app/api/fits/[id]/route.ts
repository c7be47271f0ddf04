import { getFitRecord } from "@/lib/fits";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";

export const GET = withUser<{ id: string }>({ permission: "fit:read" }, async ({ params, db, user }) => getFitRecord(db, user.labId, idParam.parse(params.id)));
