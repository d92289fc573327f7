import pg from "pg";
import { testEnv } from "./env";

let pool: pg.Pool | undefined;

export function testPool(): pg.Pool {
  pool ??= new pg.Pool({ connectionString: testEnv.databaseUrl, max: 4 });
  return pool;
}

export async function sql<T extends pg.QueryResultRow = Record<string, unknown>>(text: string, values: unknown[] = []): Promise<T[]> {
  const r = await testPool().query<T>(text, values);
  return r.rows;
}

export async function closeTestPool(): Promise<void> {
  await pool?.end();
  pool = undefined;
}
