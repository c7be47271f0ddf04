import { changeMember } from "@/lib/admin/members";
import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";
import { memberActionSchema } from "@/lib/schemas/members";

export const POST = withUser<{ userId: string }>({ permission: "user:manage" }, async ({ req, params, db, user }) =>
  changeMember(db, user, idParam.parse(params.userId), memberActionSchema.parse(await jsonBody(req))),
);
