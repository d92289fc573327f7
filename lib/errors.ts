// The one error type the app shows to people: a code, an HTTP status derived from it, and a safe message.
export const ERROR_STATUS = {
  invalid_input: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  stale: 409,
  invalid_transition: 409,
  payload_too_large: 413,
  unsupported_media: 415,
  rate_limited: 429,
  unavailable: 503,
  internal: 500,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly fields?: Record<string, string>;

  constructor(code: ErrorCode, message: string, fields?: Record<string, string>) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.fields = fields;
  }

  get status(): number {
    return ERROR_STATUS[this.code];
  }

  toJSON() {
    return { error: { code: this.code, message: this.message, ...(this.fields ? { fields: this.fields } : {}) } };
  }
}

export function notFound(what = "That item"): AppError {
  return new AppError("not_found", `${what} was not found.`);
}

export function isAppError(e: unknown): e is AppError {
  return e instanceof AppError;
}

// Anything that is not an AppError is logged and shown as a generic message.
export function toAppError(e: unknown): AppError {
  if (isAppError(e)) return e;
  console.error("[bandedge] unexpected error", e);
  return new AppError("internal", "Something went wrong on our side. Please try again.");
}
