// Reading an uploaded file from a multipart request: the size limit is checked before the body is read (declared
// length) or while it streams (chunked), never after a whole over-limit upload is in memory.
import { AppError } from "@/lib/errors";
import { checkSize } from "@/lib/ingest";
import { readBounded } from "./body";

/** Room for the form's other fields (mapping, metadata, the previewed SHA-256) and the multipart boundaries. */
export const FORM_OVERHEAD_BYTES = 256 * 1024;

export async function uploadedFile(form: FormData, field = "file"): Promise<{ name: string; bytes: Uint8Array }> {
  const f = form.get(field);
  if (!(f instanceof File)) throw new AppError({ code: "bad_request", message: `Send the export as a multipart field named "${field}".` });
  checkSize(f.name || "the file", f.size);
  return { name: f.name || "upload", bytes: new Uint8Array(await f.arrayBuffer()) };
}

/** The multipart form of an upload whose file may be at most `maxFileBytes` (the lab's limit). */
export async function formOf(req: Request, maxFileBytes: number): Promise<FormData> {
  const type = req.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data\s*;/i.test(type)) throw new AppError({ code: "bad_request", message: "The request is not a multipart form upload." });
  const bytes = await readBounded(
    req,
    maxFileBytes + FORM_OVERHEAD_BYTES,
    () => new AppError({ code: "payload_too_large", message: `The upload is over the limit of ${Math.round(maxFileBytes / 1048576)} MB per file; nothing was read or stored.` }),
  );
  try {
    return await new Response(bytes as BodyInit, { headers: { "content-type": type } }).formData();
  } catch {
    throw new AppError({ code: "bad_request", message: "The request is not a multipart form upload." });
  }
}
