import { attachment } from "@/lib/http/download";
import { z } from "zod";
import { fitDataCsv, fitParametersCsv } from "@/lib/fits";
import { withUser } from "@/lib/http/with-user";
import { idParam } from "@/lib/schemas/common";

const query = z.object({ kind: z.enum(["data", "parameters"]).default("data") });

// CSV of the data with fitted values, residuals and exclusion flags, or of the parameter table.
export const GET = withUser<{ id: string }>({ permission: "fit:read" }, async ({ req, params, db, user }) => {
  const { kind } = query.parse(Object.fromEntries(new URL(req.url).searchParams));
  const id = idParam.parse(params.id);
  const f = kind === "data" ? await fitDataCsv(db, user.labId, id) : await fitParametersCsv(db, user.labId, id);
  return new Response(f.text, { headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": attachment(f.name) } });
});
