import { withUser } from "@/lib/http/with-user";
import { formOf, uploadedFile } from "@/lib/http/multipart";
import { previewUpload, uploadLimitBytes } from "@/lib/ingest";

// Parses an export and answers with its preview; nothing is stored until POST /api/runs.
export const POST = withUser({ permission: "run:upload" }, async ({ req, db, user }) => {
  const form = await formOf(req, await uploadLimitBytes(db, user.labId));
  const { name, bytes } = await uploadedFile(form);
  const parser = form.get("parser");
  const timeColumn = form.get("timeColumn");
  return previewUpload(db, user.labId, bytes, name, {
    parser: typeof parser === "string" && parser ? parser : undefined,
    timeColumn: typeof timeColumn === "string" && timeColumn ? timeColumn : undefined,
  });
});
