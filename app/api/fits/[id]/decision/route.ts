import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { decideFit } from "@/lib/reviews";
import { idParam } from "@/lib/schemas/common";
import { decisionSchema } from "@/lib/schemas/reviews";

export const POST = withUser<{ id: string }>({ permission: "review:decide" }, async ({ req, params, db, user }) =>
  decideFit(db, user, idParam.parse(params.id), decisionSchema.parse(await jsonBody(req))),
);
