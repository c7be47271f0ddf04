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

export function toErrorBody(e: unknown): { status: number; body: ErrorBody } {
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

export function toErrorResponse(e: unknown): Response {
  const { status, body } = toErrorBody(e);
  const headers: Record<string, string> = {};
  if (e instanceof AppError && e.retryAfter) headers["retry-after"] = String(e.retryAfter);
  if (status === 401) headers["www-authenticate"] = 'Bearer realm="halflight"';
  return Response.json(body, { status, headers });
}
