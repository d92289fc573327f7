// A render worker for the pool tests: answers with its thread id, after an optional pause, or misbehaves
// on request (never answers, exits, throws outside the task).
import { threadId } from "node:worker_threads";

export default async function task(input) {
  if (input.wait) await new Promise((resolve) => setTimeout(resolve, input.wait));
  if (input.hang) await new Promise(() => {});
  if (input.exit) process.exit(input.exit);
  if (input.uncaught)
    setTimeout(() => {
      throw new Error("the renderer blew up");
    });
  if (input.uncaught) await new Promise(() => {});
  if (input.reject) throw new Error(input.reject);
  return { threadId, value: input.value };
}
