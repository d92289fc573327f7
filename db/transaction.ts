import { drizzle } from "drizzle-orm/node-postgres";
import type { PoolClient } from "pg";
import { isDatabaseUnavailable } from "./availability";
import { pool, schema, type Database } from "./index";

export type RawSql = { executeSql(text: string, values: unknown[]): Promise<{ rows: unknown[] }> };
export type TxContext = { tx: Database; raw: RawSql };

const RETRYABLE = new Set(["40001", "40P01"]); // serialization failure, deadlock

// One transaction on one connection, shared by Drizzle and by the queue (so a queued job commits with the change).
export async function transaction<T>(fn: (ctx: TxContext) => Promise<T>, { retries = 3 } = {}): Promise<T> {
  for (let attempt = 0; ; attempt++) {
    const client: PoolClient = await pool().connect();
    let broken = false;
    try {
      await client.query("begin");
      const tx = drizzle(client, { schema }) as unknown as Database;
      const raw: RawSql = {
        executeSql: async (text, values) => {
          const r = await client.query(text, values as unknown[]);
          return { rows: r.rows };
        },
      };
      const result = await fn({ tx, raw });
      await client.query("commit");
      return result;
    } catch (error) {
      // A connection that timed out or was lost is discarded rather than rolled back and reused: a rollback
      // would only queue behind the stuck statement.
      if (isDatabaseUnavailable(error)) broken = true;
      else await client.query("rollback").catch(() => (broken = true));
      const code = (error as { code?: string }).code ?? (error as { cause?: { code?: string } }).cause?.code;
      if (code && RETRYABLE.has(code) && attempt < retries) continue;
      throw error;
    } finally {
      client.release(broken);
    }
  }
}
