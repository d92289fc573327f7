import "server-only";
import { startEmailWorker, sweepStuckEmails } from "./mail";
import { stopBoss } from "./queue";
import { sweepOpenRefunds } from "./services/refunds";
import { env } from "./env";
import { sweepUnattachedUploads } from "./uploads/sweep";

// How often each instance looks for work a crash or a lost answer left behind. Both sweeps are safe to run
// from several instances at once: a message keeps its provider idempotency key, a refund its processor one,
// an abandoned upload is removed from the store before its row.
const MAIL_SWEEP_MS = 15_000;
const REFUND_SWEEP_MS = 60_000;

function every(ms: number, what: string, fn: () => Promise<unknown>) {
  let running = false;
  const tick = async () => {
    if (running) return;
    running = true;
    try {
      await fn();
    } catch (e) {
      console.error(`[bandedge] ${what} sweep failed; next round in ${ms / 1000} s`, e);
    } finally {
      running = false;
    }
  };
  setInterval(() => void tick(), ms).unref();
  void tick();
}

export async function startWorkers(): Promise<void> {
  await startEmailWorker();
  every(MAIL_SWEEP_MS, "e-mail", () => sweepStuckEmails());
  every(REFUND_SWEEP_MS, "refund", () => sweepOpenRefunds());
  every(env().PHOTO_SWEEP_SECONDS * 1000, "abandoned upload", () => sweepUnattachedUploads());
}

/** Stops fetching jobs, lets the jobs in hand finish (up to timeoutMs), then closes the queue's connections. */
export async function stopWorkers(timeoutMs: number): Promise<void> {
  await stopBoss(timeoutMs);
}
