// Reading an uploaded file from a multipart request, with the size limit checked before the bytes are read.
import { AppError } from "@/lib/errors";
import { checkSize } from "@/lib/ingest";

export async function uploadedFile(form: FormData, field = "file"): Promise<{ name: string; bytes: Uint8Array }> {
  const f = form.get(field);
  if (!(f instanceof File)) throw new AppError({ code: "bad_request", message: `Send the export as a multipart field named "${field}".` });
  checkSize(f.name || "the file", f.size);
  return { name: f.name || "upload", bytes: new Uint8Array(await f.arrayBuffer()) };
}

export async function formOf(req: Request): Promise<FormData> {
  try {
    return await req.formData();
  } catch {
    throw new AppError({ code: "bad_request", message: "The request is not a multipart form upload." });
  }
}
