import { withUser } from "@/lib/http/with-user";
import { seriesForDisplay } from "@/lib/runs";
import { idParam } from "@/lib/schemas/common";
import { seriesPointsQuerySchema } from "@/lib/schemas/runs";

// Chart-ready points, decimated (lib/plot/decimate.ts) to about maxPoints; every point is at …/points, as binary.
export const GET = withUser<{ id: string; sid: string }>({ permission: "run:read" }, async ({ req, params, db, user }) => {
  const q = seriesPointsQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  return seriesForDisplay(db, user.labId, idParam.parse(params.id), idParam.parse(params.sid), { maxPoints: q.maxPoints });
});
