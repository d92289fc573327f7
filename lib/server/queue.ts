import "server-only";
import PgBoss from "pg-boss";
import { env } from "./env";

export const QUEUES = { email: "email" } as const;

const g = globalThis as unknown as { bandedgeBoss?: Promise<PgBoss> };

// The queue lives in PostgreSQL beside the data, so app instances stay stateless.
export function getBoss(): Promise<PgBoss> {
  if (!g.bandedgeBoss) {
    g.bandedgeBoss = (async () => {
      const boss = new PgBoss({ connectionString: env().DATABASE_URL, max: 4 });
      boss.on("error", (e) => console.error("[bandedge] queue error", e));
      await boss.start();
      for (const name of Object.values(QUEUES)) {
        await boss.createQueue(name).catch(() => undefined);
      }
      return boss;
    })().catch((e) => {
      g.bandedgeBoss = undefined;
      throw e;
    });
  }
  return g.bandedgeBoss;
}

/** Graceful stop for shutdown: active jobs finish (up to timeoutMs); unfinished ones are failed for a retry. */
export async function stopBoss(timeoutMs: number): Promise<void> {
  const pending = g.bandedgeBoss;
  if (!pending) return;
  const boss = await pending.catch(() => undefined);
  g.bandedgeBoss = undefined;
  if (!boss) return;
  await boss.stop({ graceful: true, wait: true, timeout: timeoutMs });
}
