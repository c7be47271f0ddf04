import { changeLabSettings, getLabSettings } from "@/lib/admin/settings";
import { jsonBody } from "@/lib/http/json-body";
import { withUser } from "@/lib/http/with-user";
import { labSettingsSchema } from "@/lib/schemas/admin";

export const GET = withUser({ permission: "user:manage" }, async ({ db, user }) => getLabSettings(db, user.labId));

export const PUT = withUser({ permission: "user:manage" }, async ({ req, db, user }) => changeLabSettings(db, user, labSettingsSchema.parse(await jsonBody(req))));
