import { withUser } from "@/lib/http/with-user";
import { runAndStoreValidation, validationRuns } from "@/lib/validation/records";

export const GET = withUser({ permission: "validation:run" }, async ({ db, user }) => ({ runs: await validationRuns(db, user.labId) }));

// Runs every reference case on this installation (a few seconds) and stores the report.
export const POST = withUser({ permission: "validation:run" }, async ({ db, user }) => Response.json(await runAndStoreValidation(db, user), { status: 201 }));
