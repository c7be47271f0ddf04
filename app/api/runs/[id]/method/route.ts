import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { assignRunMethod } from "@/lib/methods";
import { idParam } from "@/lib/schemas/common";
import { assignMethodSchema } from "@/lib/schemas/methods";

// Assigns a method to a run after ingest (or clears it), with a reason; audited.
export const POST = withUser<{ id: string }>({ permission: "run:upload" }, async ({ req, params, db, user }) => {
  const body = assignMethodSchema.parse(await jsonBody(req));
  return assignRunMethod(db, user, idParam.parse(params.id), body.methodId, body.reason, body.wavelengthReason);
});
