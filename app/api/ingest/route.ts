import { getDb } from "@/db";
import { authenticateApiKey } from "@/lib/admin/api-keys";
import { AppError } from "@/lib/errors";
import { toErrorResponse } from "@/lib/http/errors";
import { formOf, uploadedFile } from "@/lib/http/multipart";
import { clientAddress } from "@/lib/http/rate-limit";
import { ingestExport, uploadLimitBytes } from "@/lib/ingest";
import { runMappingSchema } from "@/lib/schemas/runs";

// Instrument upload: `Authorization: Bearer <key>`, multipart with `file` and optional `mapping` (JSON, as on the
// upload page) and `metadata` (JSON: run fields such as temperature_c, operator, method_id). The same ingest
// transaction as the upload page; the key's lab is the only lab it can write into.
export async function POST(req: Request): Promise<Response> {
  try {
    const db = await getDb();
    const key = await authenticateApiKey(db, req.headers.get("authorization"), clientAddress(req.headers));
    const form = await formOf(req, await uploadLimitBytes(db, key.labId));
    const { name, bytes } = await uploadedFile(form);
    const mapping = runMappingSchema.parse({ ...jsonField(form, "mapping"), run: { ...(jsonField(form, "mapping").run as object | undefined), ...jsonField(form, "metadata") } });
    const result = await ingestExport(db, { labId: key.labId, userId: null, actorLabel: `API key ${key.prefix}… (${key.name})`, bytes, fileName: name, mapping });
    return Response.json(result, { status: result.existing ? 200 : 201 });
  } catch (e) {
    return toErrorResponse(e);
  }
}

function jsonField(form: FormData, field: string): Record<string, unknown> {
  const raw = form.get(field);
  if (typeof raw !== "string" || raw.trim() === "") return {};
  try {
    const v = JSON.parse(raw);
    if (v && typeof v === "object" && !Array.isArray(v)) return v as Record<string, unknown>;
  } catch {
    /* answered below */
  }
  throw new AppError({ code: "bad_request", message: `The "${field}" field is not a JSON object.` });
}
