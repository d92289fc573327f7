// Each app instance checks its settings (and, in the local demo, that it listens on loopback only), works
// the PostgreSQL-backed queue (e-mail and other side effects), and shuts down gracefully on SIGTERM
// (lib/server/shutdown.ts).
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  if (process.env.NEXT_PHASE !== "phase-production-build") {
    const { startupProblem } = await import("@/lib/server/startup");
    const check = () => {
      const problem = startupProblem();
      if (!problem) return;
      console.error(`[bandedge] refusing to start: ${problem}`);
      process.exit(1);
    };
    check();
    // The server may only start listening once this returns: look again when it has.
    setTimeout(check, 1000).unref();
  }
  const { installGracefulShutdown } = await import("@/lib/server/shutdown");
  installGracefulShutdown();
  if (process.env.WORKER_ENABLED === "0") return;
  const { startWorkers } = await import("@/lib/server/workers");
  await startWorkers().catch((e: unknown) => console.error("[bandedge] workers did not start", e));
}
