// Telling "the database is not answering" apart from every other failure, so the app can say so (503 with
// Retry-After) instead of a generic error. node-postgres and Drizzle wrap errors, so the cause chain is walked.

// Network failures of the socket to PostgreSQL.
const NETWORK_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "EPIPE", "ENOTFOUND", "EHOSTUNREACH", "ENETUNREACH"]);
// SQLSTATEs: shutting down or starting up, too many connections, statement or idle-in-transaction timeout.
const UNAVAILABLE_SQLSTATES = new Set(["57P01", "57P02", "57P03", "53300", "57014", "25P03"]);
// node-postgres reports its own timeouts and lost connections by message only.
const UNAVAILABLE_MESSAGES =
  /timeout exceeded when trying to connect|Query read timeout|Connection terminated|connection error|Client was closed|Cannot use a pool after calling end/i;

export function isDatabaseUnavailable(error: unknown): boolean {
  let e: unknown = error;
  for (let depth = 0; e && depth < 6; depth++) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === "string" && (NETWORK_CODES.has(code) || UNAVAILABLE_SQLSTATES.has(code) || code.startsWith("08"))) return true;
    const message = (e as { message?: unknown }).message;
    if (typeof message === "string" && UNAVAILABLE_MESSAGES.test(message)) return true;
    if (e instanceof AggregateError && e.errors.some((inner) => isDatabaseUnavailable(inner))) return true;
    e = (e as { cause?: unknown }).cause;
  }
  return false;
}

// When a connection was last seen lost (an idle client's error, a query that could not reach the server), so a
// probe answer from before that moment is not reused.
const lost = globalThis as unknown as { bandedgeDbLostAt?: number };

export function markDatabaseLost(): void {
  lost.bandedgeDbLostAt = Date.now();
}

export function databaseLastLostAt(): number {
  return lost.bandedgeDbLostAt ?? 0;
}
