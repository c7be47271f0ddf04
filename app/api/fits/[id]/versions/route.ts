import { fitVersions } from "@/lib/fits";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";

export const GET = withUser<{ id: string }>({ permission: "fit:read" }, async ({ params, db, user }) => ({ versions: await fitVersions(db, user.labId, idParam.parse(params.id)) }));
