import { withUser } from "@/lib/http/with-user";
import { seriesBinary } from "@/lib/runs";
import { idParam } from "@/lib/schemas/common";

// Every point of a series for fitting, as binary: n little-endian float64 times (s), then n readings; n in
// X-Series-Points. The stored bytes go out as they are (no JSON of megabytes, no parsing on either side).
export const GET = withUser<{ id: string; sid: string }>({ permission: "run:read" }, async ({ params, db, user }) => {
  const s = await seriesBinary(db, user.labId, idParam.parse(params.id), idParam.parse(params.sid));
  return new Response(new Blob([new Uint8Array(s.t), new Uint8Array(s.y)]), {
    headers: {
      "content-type": "application/octet-stream",
      "content-length": String(s.t.byteLength + s.y.byteLength),
      "x-series-points": String(s.points),
      "x-series-layout": "t float64le[n] (s), then y float64le[n]",
      "cache-control": "private, max-age=0, must-revalidate",
    },
  });
});
