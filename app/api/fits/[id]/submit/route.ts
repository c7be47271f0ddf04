import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { submitFit } from "@/lib/reviews";
import { idParam } from "@/lib/schemas/common";
import { submitSchema } from "@/lib/schemas/reviews";

// Submitting is a signed act (meaning "authored"): the password is asked again.
export const POST = withUser<{ id: string }>({ permission: "fit:submit" }, async ({ req, params, db, user }) => {
  const { password } = submitSchema.parse(await jsonBody(req));
  return submitFit(db, user, idParam.parse(params.id), password);
});
