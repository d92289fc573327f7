import "server-only";
import { startEmailWorker } from "./mail";
import { stopBoss } from "./queue";

export async function startWorkers(): Promise<void> {
  await startEmailWorker();
}

/** Stops fetching jobs, lets the jobs in hand finish (up to timeoutMs), then closes the queue's connections. */
export async function stopWorkers(timeoutMs: number): Promise<void> {
  await stopBoss(timeoutMs);
}
