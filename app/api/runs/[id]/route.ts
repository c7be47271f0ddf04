import { withUser } from "@/lib/http/with-user";
import { getRunDetail } from "@/lib/runs";
import { idParam } from "@/lib/schemas/common";

export const GET = withUser<{ id: string }>({ permission: "run:read" }, async ({ params, db, user }) =>
  getRunDetail(db, user.labId, idParam.parse(params.id)),
);
