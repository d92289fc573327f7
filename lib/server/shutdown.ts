import "server-only";
import { pool } from "@/db";
import { env } from "./env";
import { stopWorkers } from "./workers";

const g = globalThis as unknown as { bandedgeShutdownInstalled?: boolean };

/**
 * Graceful shutdown on SIGTERM, within SHUTDOWN_GRACE_MS. The framework's own handler stops accepting
 * connections and waits for the requests in flight before it exits; that exit is held here until the queue
 * worker has finished the jobs it holds (none is left half-sent) and the database pool is closed. If any of
 * it takes longer than the grace period the process exits anyway, with code 1.
 */
export function installGracefulShutdown(): void {
  if (g.bandedgeShutdownInstalled) return;
  g.bandedgeShutdownInstalled = true;
  let started = false;
  process.on("SIGTERM", () => {
    if (started) return;
    started = true;
    const startedAt = Date.now();
    const grace = env().SHUTDOWN_GRACE_MS;
    console.log(`[bandedge] SIGTERM: finishing requests in flight (at most ${grace} ms)`);
    const exit = process.exit.bind(process);
    const force = setTimeout(() => {
      console.error("[bandedge] shutdown did not finish within the grace period; exiting now");
      exit(1);
    }, grace);
    force.unref();
    let closing: Promise<void> | undefined;
    // Called by the framework once the HTTP server is closed and its requests are answered.
    process.exit = ((code?: number) => {
      closing ??= (async () => {
        const left = Math.max(1_000, grace - (Date.now() - startedAt) - 500);
        await stopWorkers(left).catch((e: unknown) => console.error("[bandedge] queue worker did not stop cleanly", e));
        await pool()
          .end()
          .catch((e: unknown) => console.error("[bandedge] database pool did not close cleanly", e));
        console.log(`[bandedge] shut down cleanly in ${Date.now() - startedAt} ms`);
        exit(typeof code === "number" ? code : 0);
      })();
      return undefined as never;
    }) as typeof process.exit;
  });
}
