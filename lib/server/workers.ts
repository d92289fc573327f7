import "server-only";
import { startEmailWorker } from "./mail";

export async function startWorkers(): Promise<void> {
  await startEmailWorker();
}
