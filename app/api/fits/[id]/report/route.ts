import { attachment } from "@/lib/http/download";
import { withUser } from "@/lib/http/with-user";
import { fitReportPdf } from "@/lib/reports/records";
import { idParam } from "@/lib/schemas/common";

// The PDF report of one record version.
export const GET = withUser<{ id: string }>({ permission: "fit:read" }, async ({ params, db, user }) => {
  const pdf = await fitReportPdf(db, user.labId, user.labName, idParam.parse(params.id));
  return new Response(new Uint8Array(pdf.bytes), { headers: { "content-type": "application/pdf", "content-disposition": attachment(pdf.name) } });
});
