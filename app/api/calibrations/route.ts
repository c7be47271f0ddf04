import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { createCalibration, listCalibrations } from "@/lib/methods";
import { createCalibrationSchema, listQuerySchema } from "@/lib/schemas/methods";

export const GET = withUser({ permission: "method:read" }, async ({ req, db, user }) => listCalibrations(db, user.labId, listQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams))));

export const POST = withUser({ permission: "calibration:write" }, async ({ req, db, user }) =>
  Response.json(await createCalibration(db, user, createCalibrationSchema.parse(await jsonBody(req))), { status: 201 }),
);
