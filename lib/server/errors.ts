import "server-only";
import { isDatabaseUnavailable, markDatabaseLost } from "@/db/availability";
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

/**
 * Where a parsed JSON value holds a NUL character (in a string or a key), as a dotted path ("_" for the
 * value itself); null when there is none. PostgreSQL text cannot store NUL, so such input is refused up front.
 */
export function nulCharacterPath(value: unknown): string | null {
  const stack: [unknown, string][] = [[value, ""]];
  while (stack.length) {
    const [v, path] = stack.pop()!;
    if (typeof v === "string") {
      if (v.includes("\u0000")) return path || "_";
    } else if (v && typeof v === "object") {
      for (const [k, child] of Object.entries(v)) {
        const p = path ? `${path}.${k}` : k;
        if (k.includes("\u0000")) return p;
        stack.push([child, p]);
      }
    }
  }
  return null;
}

// Half of a UTF-16 surrogate pair on its own: JSON can carry it (\ud800), but it is no character and the
// database refuses it in text kept as JSON (the audit log, set profiles).
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** The path of the first string (or key) holding half a surrogate pair, or null. */
export function loneSurrogatePath(value: unknown): string | null {
  const stack: [unknown, string][] = [[value, ""]];
  while (stack.length) {
    const [v, path] = stack.pop()!;
    if (typeof v === "string") {
      if (LONE_SURROGATE.test(v)) return path || "_";
    } else if (v && typeof v === "object") {
      for (const [k, child] of Object.entries(v)) {
        const p = path ? `${path}.${k}` : k;
        if (LONE_SURROGATE.test(k)) return p;
        stack.push([child, p]);
      }
    }
  }
  return null;
}

export const LONE_SURROGATE_MESSAGE = "This text contains a broken character (half of a pair), which cannot be stored. Type it again.";

export const NUL_MESSAGE = "This text contains a NUL character (\\0), which cannot be stored. Remove it and try again.";

// The database refuses text it cannot store (a NUL character from a query string, say): that is bad input.
function isUnstorableText(e: unknown): boolean {
  const code = (e as { code?: unknown } | null)?.code ?? (e as { cause?: { code?: unknown } } | null)?.cause?.code;
  return code === "22021" || code === "22P05";
}

// The innermost cause's code and message: a wrapped query error's own message carries the query's
// parameters (session tokens among them), which must not reach the log.
function rootCause(e: unknown): string {
  let inner: unknown = e;
  for (let depth = 0; depth < 6 && (inner as { cause?: unknown } | null)?.cause; depth++) inner = (inner as { cause: unknown }).cause;
  const code = (inner as { code?: unknown } | null)?.code;
  const message = inner instanceof Error ? inner.message : String(inner);
  return code ? `${String(code)} ${message}` : message;
}

/** Seconds a client is asked to wait (Retry-After) when the database is not answering. */
export const DATABASE_RETRY_AFTER_SECONDS = 15;

export const DATABASE_UNAVAILABLE_MESSAGE =
  "The workshop's records cannot be reached right now. Nothing was changed; please try again in a minute.";

export function databaseUnavailable(): AppError {
  return new AppError("unavailable", DATABASE_UNAVAILABLE_MESSAGE);
}

// Anything that is not an AppError is logged and shown as a generic message.
export function toAppError(e: unknown): AppError {
  if (isAppError(e)) return e;
  if (isUnstorableText(e)) return new AppError("invalid_input", NUL_MESSAGE);
  if (isDatabaseUnavailable(e)) {
    markDatabaseLost();
    console.error("[bandedge] database unavailable:", rootCause(e));
    return databaseUnavailable();
  }
  console.error("[bandedge] unexpected error", e);
  return new AppError("internal", "Something went wrong on our side. Please try again.");
}
