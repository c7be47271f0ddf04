import { withUser } from "@/lib/http/with-user";
import { reviewQueue } from "@/lib/reviews";

export const GET = withUser({ permission: "review:read" }, async ({ db, user }) => ({ queue: await reviewQueue(db, user.labId) }));
