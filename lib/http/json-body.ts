// Reading a JSON request body: bounded while it streams (413 before the rest is read), a plain 400 when it is not JSON.
import { AppError } from "@/lib/errors";
import { readBounded } from "./body";

/** JSON bodies of the app are small: options, comments, definitions. Routes that need more say so. */
export const JSON_BODY_LIMIT = 1_048_576;

export async function jsonBody(req: Request, limit = JSON_BODY_LIMIT): Promise<unknown> {
  const bytes = await readBounded(req, limit, () => new AppError({ code: "payload_too_large", message: `The request body is over ${Math.round(limit / 1024)} KiB, the most this request accepts.` }));
  try {
    return JSON.parse(new TextDecoder().decode(bytes));
  } catch {
    throw new AppError({ code: "bad_request", message: "Send the request body as JSON." });
  }
}
