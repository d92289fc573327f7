import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { env } from "@/lib/server/env";
import * as schema from "./schema";

export type Database = NodePgDatabase<typeof schema>;
export type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

// The one database client. Kept on globalThis so dev reloads do not leak pools.
const globalForDb = globalThis as unknown as { bandedgePool?: Pool; bandedgeDb?: Database };

export function pool(): Pool {
  if (!globalForDb.bandedgePool) {
    // A request waits at most this long for a connection (pg-pool applies it to acquiring a pooled client as
    // well as to connecting): a busy moment answers a retryable 503 instead of hanging every page.
    globalForDb.bandedgePool = new Pool({ connectionString: env().DATABASE_URL, max: 10, connectionTimeoutMillis: 5_000 });
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
