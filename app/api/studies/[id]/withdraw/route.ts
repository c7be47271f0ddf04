import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { withdrawRecord } from "@/lib/reviews";
import { idParam } from "@/lib/schemas/common";
import { withdrawSchema } from "@/lib/schemas/reviews";

export const POST = withUser<{ id: string }>({ permission: "study:write" }, async ({ req, params, db, user }) =>
  withdrawRecord(db, user, "study", idParam.parse(params.id), withdrawSchema.parse(await jsonBody(req)).reason),
);
