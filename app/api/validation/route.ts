import { withUser } from "@/lib/http/with-user";
import { enqueueJob } from "@/lib/jobs/background";
import { validationRuns } from "@/lib/validation/records";

export const GET = withUser({ permission: "validation:run" }, async ({ db, user }) => ({ runs: await validationRuns(db, user.labId) }));

// Queues a run of every reference case on this installation and answers at once (202) with the job to watch at
// /api/jobs/ID; the stored report's id is in the job's result when it is done.
export const POST = withUser({ permission: "validation:run" }, async ({ db, user }) => Response.json({ job: await enqueueJob(db, user, "validation-run") }, { status: 202 }));
