import { withUser } from "@/lib/http/with-user";
import { jobStatus } from "@/lib/jobs/background";
import { idParam } from "@/lib/schemas/common";

// A background job's state and progress (validation runs are the only kind, hence their permission).
export const GET = withUser<{ id: string }>({ permission: "validation:run" }, async ({ params, db, user }) => ({ job: await jobStatus(db, user.labId, idParam.parse(params.id)) }));
