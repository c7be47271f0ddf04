import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { decideRecord } from "@/lib/reviews";
import { idParam } from "@/lib/schemas/common";
import { decisionSchema } from "@/lib/schemas/reviews";

export const POST = withUser<{ id: string }>({ permission: "review:decide" }, async ({ req, params, db, user }) =>
  decideRecord(db, user, "study", idParam.parse(params.id), decisionSchema.parse(await jsonBody(req))),
);
