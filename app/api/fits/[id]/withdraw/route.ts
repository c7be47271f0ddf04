import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { withdrawFit } from "@/lib/reviews";
import { idParam } from "@/lib/schemas/common";
import { withdrawSchema } from "@/lib/schemas/reviews";

export const POST = withUser<{ id: string }>({ permission: "fit:submit" }, async ({ req, params, db, user }) =>
  withdrawFit(db, user, idParam.parse(params.id), withdrawSchema.parse(await jsonBody(req)).reason),
);
