import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { env } from "@/lib/server/env";
import { databaseLastLostAt, markDatabaseLost } from "./availability";
import * as schema from "./schema";

export type Database = NodePgDatabase<typeof schema>;
export type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

// The one database client. Kept on globalThis so dev reloads do not leak pools.
const globalForDb = globalThis as unknown as { bandedgePool?: Pool; bandedgeDb?: Database };

export function pool(): Pool {
  if (!globalForDb.bandedgePool) {
    const settings = env();
    // A stopped server fails fast (connect timeout; pg-pool applies it to acquiring a pooled client too, so a
    // busy moment answers a retryable 503 instead of hanging every page); a frozen one cannot run the server-side timeouts, so
    // the client gives up on a query a little after the statement timeout would have ended it.
    const created = new Pool({
      connectionString: settings.DATABASE_URL,
      max: 10,
      connectionTimeoutMillis: settings.DB_CONNECT_TIMEOUT_MS,
      statement_timeout: settings.DB_STATEMENT_TIMEOUT_MS,
      query_timeout: settings.DB_STATEMENT_TIMEOUT_MS + 2_000,
      idle_in_transaction_session_timeout: settings.DB_IDLE_IN_TRANSACTION_TIMEOUT_MS,
      keepAlive: true,
    });
    // An idle connection dropped by a restarting server must not take the process down; the pool replaces it.
    created.on("error", (e) => {
      markDatabaseLost();
      console.error("[bandedge] idle database connection lost:", e.message);
    });
    globalForDb.bandedgePool = created;
  }
  return globalForDb.bandedgePool;
}

export function getDb(): Database {
  if (!globalForDb.bandedgeDb) {
    globalForDb.bandedgeDb = drizzle(pool(), { schema });
  }
  return globalForDb.bandedgeDb;
}

export const db: Database = new Proxy({} as Database, {
  get(_target, prop, receiver) {
    return Reflect.get(getDb(), prop, receiver);
  },
});

export { schema };

/**
 * One trivial round trip, bounded: true when PostgreSQL answers within the time. (A probe left waiting on a
 * frozen server ends with the pool's own query timeout, which discards its connection.)
 */
export async function databaseReachable(timeoutMs = 2_000): Promise<boolean> {
  let timer: ReturnType<typeof setTimeout> | undefined;
  const timeout = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), timeoutMs);
  });
  try {
    const probe = pool()
      .query("select 1")
      .then(() => true as const)
      .catch(() => false as const);
    return await Promise.race([probe, timeout]);
  } finally {
    clearTimeout(timer);
  }
}

// The last answer of the shared probe, reused for a second, and the moment a connection was last seen lost: a
// loss after the probe makes the next caller ask again rather than trust an answer from before the loss.
const probeState = globalThis as unknown as { bandedgeDbProbe?: { at: number; ok: Promise<boolean> } };
const PROBE_REUSE_MS = 1_000;

/** One probe a second at most, shared by the requests that arrive meanwhile, and never reused across a loss. */
export function databaseAnswersRecently(): Promise<boolean> {
  const now = Date.now();
  const last = probeState.bandedgeDbProbe;
  const lostAt = databaseLastLostAt();
  if (last && now - last.at < PROBE_REUSE_MS && lostAt < last.at) return last.ok;
  const ok = databaseReachable(2_000);
  probeState.bandedgeDbProbe = { at: now, ok };
  return ok;
}
