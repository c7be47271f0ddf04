import { attachment } from "@/lib/http/download";
import { withUser } from "@/lib/http/with-user";
import { validationReportPdf } from "@/lib/reports/records";
import { idParam } from "@/lib/schemas/common";
import { getValidationRecord } from "@/lib/validation/records";

export const GET = withUser<{ id: string }>({ permission: "validation:run" }, async ({ req, params, db, user }) => {
  const rec = await getValidationRecord(db, user.labId, idParam.parse(params.id));
  if (new URL(req.url).searchParams.get("format") === "json")
    return new Response(JSON.stringify(rec, null, 2), { headers: { "content-type": "application/json", "content-disposition": attachment(`halflight-validation-${rec.id}.json`) } });
  const pdf = await validationReportPdf(rec, user.labName);
  return new Response(new Uint8Array(pdf.bytes), { headers: { "content-type": "application/pdf", "content-disposition": attachment(pdf.name) } });
});
