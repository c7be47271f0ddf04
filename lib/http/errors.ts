// The one translator from thrown errors to the API's error envelope { error: { code, message, issues? } }.
import { ZodError } from "zod";
import { AppError, ERROR_CODES, type ErrorCode, type ErrorIssue } from "@/lib/errors";

export interface ErrorBody {
  error: { code: ErrorCode; message: string; issues?: ErrorIssue[]; line?: number };
}

// better-sqlite3 reports constraint failures through error.code, never to be matched by message text.
const SQLITE_CONFLICT_CODES = new Set([
  "SQLITE_CONSTRAINT_UNIQUE",
  "SQLITE_CONSTRAINT_PRIMARYKEY",
  "SQLITE_CONSTRAINT_FOREIGNKEY",
  "23505", // PostgreSQL unique_violation
  "23503", // PostgreSQL foreign_key_violation
]);

/** Storage that cannot take a write: the transaction rolled back, so nothing was half-written; said in plain words. */
function storageRefusal(code: string): AppError | null {
  if (code === "SQLITE_FULL" || code === "53100")
    return new AppError({ code: "insufficient_storage", message: "The server's disk is full, so nothing was saved (the change was rolled back whole). Tell the administrator; try again once there is room." });
  if (code.startsWith("SQLITE_READONLY") || code === "25006")
    return new AppError({ code: "unavailable", message: "The database cannot be written at the moment (it is read-only), so nothing was saved. Tell the administrator.", retryAfter: 60 });
  if (code === "SQLITE_BUSY" || code === "SQLITE_LOCKED" || code === "40001" || code === "40P01")
    return new AppError({ code: "unavailable", message: "The database is busy with other writes; nothing was saved. Try again in a moment.", retryAfter: 2 });
  return null;
}

/** A database error the user should hear about in plain words (disk full, read-only, busy), as an AppError; else the error. */
function plain(e: unknown): unknown {
  const dbCode = (e as { code?: unknown } | null)?.code;
  const storage = typeof dbCode === "string" ? storageRefusal(dbCode) : null;
  if (!storage) return e;
  // The driver's message carries the whole statement (with uploaded bytes): the log gets the code and the reason only.
  const reason = e instanceof Error ? e.message.split(" - ").pop()!.slice(0, 200) : "";
  console.error(`The database refused a write (${String(dbCode)}): ${reason}`);
  return storage;
}

export function toErrorBody(error: unknown): { status: number; body: ErrorBody } {
  const e = plain(error);
  if (e instanceof AppError) {
    return {
      status: e.status,
      body: { error: { code: e.code, message: e.message, issues: e.issues, line: e.line } },
    };
  }
  if (e instanceof ZodError) {
    const issues = e.issues.map((i) => ({ path: i.path.join("."), message: i.message }));
    return {
      status: ERROR_CODES.unprocessable,
      body: { error: { code: "unprocessable", message: "The request is not valid.", issues } },
    };
  }
  const code = (e as { code?: unknown } | null)?.code;
  if (typeof code === "string" && SQLITE_CONFLICT_CODES.has(code)) {
    return {
      status: ERROR_CODES.conflict,
      body: { error: { code: "conflict", message: "This conflicts with a record that already exists." } },
    };
  }
  console.error(e);
  return {
    status: ERROR_CODES.internal,
    body: { error: { code: "internal", message: "Something went wrong on the server; the error has been logged." } },
  };
}

export function toErrorResponse(error: unknown): Response {
  const e = plain(error);
  const { status, body } = toErrorBody(e);
  const headers: Record<string, string> = {};
  if (e instanceof AppError && e.retryAfter) headers["retry-after"] = String(e.retryAfter);
  if (status === 401) headers["www-authenticate"] = 'Bearer realm="halflight"';
  return Response.json(body, { status, headers });
}
