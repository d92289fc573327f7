// Each app instance also works the PostgreSQL-backed queue (e-mail and other side effects), and shuts
// down gracefully on SIGTERM (lib/server/shutdown.ts).
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { installGracefulShutdown } = await import("@/lib/server/shutdown");
  installGracefulShutdown();
  if (process.env.WORKER_ENABLED === "0") return;
  const { startWorkers } = await import("@/lib/server/workers");
  await startWorkers().catch((e: unknown) => console.error("[bandedge] workers did not start", e));
}
