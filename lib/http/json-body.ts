// Reading a JSON request body, with a plain 400 when it is not JSON.
import { AppError } from "@/lib/errors";

export async function jsonBody(req: Request): Promise<unknown> {
  try {
    return await req.json();
  } catch {
    throw new AppError({ code: "bad_request", message: "Send the request body as JSON." });
  }
}
