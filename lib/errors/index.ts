// One error class for the whole app; `toErrorResponse` (lib/http/errors.ts) maps it to HTTP.
export const ERROR_CODES = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  payload_too_large: 413,
  unprocessable: 422,
  locked: 423,
  too_many_requests: 429,
  internal: 500,
  unavailable: 503,
  insufficient_storage: 507,
} as const;

export type ErrorCode = keyof typeof ERROR_CODES;

export interface ErrorIssue {
  path: string;
  message: string;
  line?: number;
}

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly issues?: ErrorIssue[];
  readonly line?: number;
  /** Seconds, sent as Retry-After with a 429. */
  readonly retryAfter?: number;

  constructor(opts: { code: ErrorCode; message: string; issues?: ErrorIssue[]; line?: number; retryAfter?: number; cause?: unknown }) {
    super(opts.message, { cause: opts.cause });
    this.name = "AppError";
    this.code = opts.code;
    this.issues = opts.issues;
    this.line = opts.line;
    this.retryAfter = opts.retryAfter;
  }

  get status(): number {
    return ERROR_CODES[this.code];
  }
}
