// JSON columns read back through zod: a stored value that no longer has the shape its readers expect is a clear
// error naming the column (and pointing at the integrity check), never a cast that lets a wrong shape travel on.
import { z } from "zod";
import { AppError } from "@/lib/errors";

export function readJson<T>(schema: z.ZodType<T>, text: string | null | undefined, what: string): T {
  let value: unknown;
  try {
    value = JSON.parse(text ?? "null");
  } catch {
    throw new AppError({ code: "internal", message: `The stored ${what} is not valid JSON. An administrator's integrity check shows what changed.` });
  }
  const r = schema.safeParse(value);
  if (!r.success) {
    const i = r.error.issues[0]!;
    throw new AppError({ code: "internal", message: `The stored ${what} does not have the expected shape (${i.path.join(".") || "value"}: ${i.message}). An administrator's integrity check shows what changed.` });
  }
  return r.data;
}

/** An object whose listed keys are present: the shape check for engine outputs stored whole (their content hash covers the rest). */
export function objectWith<T>(...keys: string[]) {
  return z.custom<T>((v) => typeof v === "object" && v !== null && !Array.isArray(v) && keys.every((k) => k in v), { message: `an object with ${keys.join(", ")}` });
}

export const jsonObject = z.record(z.string(), z.unknown());
/** Any JSON value, as stored (for recomputing hashes over exactly what is there). */
export const anyJson = z.json();
