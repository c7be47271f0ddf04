import { AppError } from "@/lib/errors";
import { withUser } from "@/lib/http/with-user";
import { formOf, uploadedFile } from "@/lib/http/multipart";
import { ingestExport, sha256Hex, uploadLimitBytes } from "@/lib/ingest";
import { listLabRuns } from "@/lib/runs";
import { runListQuerySchema, runMappingSchema } from "@/lib/schemas/runs";

export const GET = withUser({ permission: "run:read" }, async ({ req, db, user }) => {
  const q = runListQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  return listLabRuns(db, user.labId, q);
});

// Stores a previewed export with its mapping: the same bytes again (checked against the previewed SHA-256).
export const POST = withUser({ permission: "run:upload" }, async ({ req, db, user }) => {
  const form = await formOf(req, await uploadLimitBytes(db, user.labId));
  const { name, bytes } = await uploadedFile(form);
  const expected = form.get("sha256");
  if (typeof expected === "string" && expected && expected !== sha256Hex(bytes))
    throw new AppError({ code: "conflict", message: `${name} is not the file that was previewed (its SHA-256 differs). Preview it again.` });
  let mappingJson: unknown = {};
  const raw = form.get("mapping");
  if (typeof raw === "string" && raw) {
    try {
      mappingJson = JSON.parse(raw);
    } catch {
      throw new AppError({ code: "bad_request", message: 'The "mapping" field is not valid JSON.' });
    }
  }
  const mapping = runMappingSchema.parse(mappingJson);
  const result = await ingestExport(db, { labId: user.labId, userId: user.userId, bytes, fileName: name, mapping });
  return Response.json(result, { status: result.existing ? 200 : 201 });
});
