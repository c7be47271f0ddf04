import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { submitRecord } from "@/lib/reviews";
import { idParam } from "@/lib/schemas/common";
import { submitSchema } from "@/lib/schemas/reviews";

// Submitting a study version is a signed act (meaning "authored"), as for fits: the password is asked again.
export const POST = withUser<{ id: string }>({ permission: "study:write" }, async ({ req, params, db, user }) => {
  const { password } = submitSchema.parse(await jsonBody(req));
  return submitRecord(db, user, "study", idParam.parse(params.id), password);
});
