import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";
import { getStudyRecord } from "@/lib/studies";

export const GET = withUser<{ id: string }>({ permission: "study:read" }, async ({ params, db, user }) => {
  const s = await getStudyRecord(db, user.labId, idParam.parse(params.id));
  return { id: s.id, version: s.version, engine_version: s.engine_version, content_hash: s.content_hash, results: s.results };
});
