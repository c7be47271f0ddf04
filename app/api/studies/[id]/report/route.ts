import { attachment } from "@/lib/http/download";
import { withUser } from "@/lib/http/with-user";
import { studyReportPdf } from "@/lib/reports/records";
import { idParam } from "@/lib/schemas/common";

// The PDF report of one study version.
export const GET = withUser<{ id: string }>({ permission: "study:read" }, async ({ params, db, user }) => {
  const pdf = await studyReportPdf(db, user.labId, user.labName, idParam.parse(params.id));
  return new Response(new Uint8Array(pdf.bytes), { headers: { "content-type": "application/pdf", "content-disposition": attachment(pdf.name) } });
});
