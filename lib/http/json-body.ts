// Reading a JSON request body: bounded while it streams (413 before the rest is read), a plain 400 when it is not JSON.
import { AppError } from "@/lib/errors";

/** JSON bodies of the app are small: options, comments, definitions. Routes that need more say so. */
export const JSON_BODY_LIMIT = 1_048_576;

export async function jsonBody(req: Request, limit = JSON_BODY_LIMIT): Promise<unknown> {
  const tooLarge = () => new AppError({ code: "payload_too_large", message: `The request body is over ${Math.round(limit / 1024)} KiB, the most this request accepts.` });
  const declared = Number(req.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > limit) throw tooLarge();
  let text = "";
  if (req.body) {
    const reader = req.body.getReader();
    const decoder = new TextDecoder();
    let size = 0;
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      size += value.byteLength;
      if (size > limit) {
        await reader.cancel().catch(() => undefined);
        throw tooLarge();
      }
      text += decoder.decode(value, { stream: true });
    }
    text += decoder.decode();
  }
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError({ code: "bad_request", message: "Send the request body as JSON." });
  }
}
