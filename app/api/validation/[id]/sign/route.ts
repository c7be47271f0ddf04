import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";
import { submitSchema } from "@/lib/schemas/reviews";
import { signValidation } from "@/lib/validation/records";

export const POST = withUser<{ id: string }>({ permission: "validation:run" }, async ({ req, params, db, user }) =>
  signValidation(db, user, idParam.parse(params.id), submitSchema.parse(await jsonBody(req)).password),
);
