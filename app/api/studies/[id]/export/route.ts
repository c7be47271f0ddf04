import { attachment } from "@/lib/http/download";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";
import { studyCsv } from "@/lib/studies";

export const GET = withUser<{ id: string }>({ permission: "study:read" }, async ({ params, db, user }) => {
  const f = await studyCsv(db, user.labId, idParam.parse(params.id));
  return new Response(f.text, { headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": attachment(f.name) } });
});
