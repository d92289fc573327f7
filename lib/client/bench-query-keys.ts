import type { QueueQueryInput } from "@/lib/validation/bench";

// One key factory for the bench; mutations invalidate exactly the keys they change.
export const benchKeys = {
  all: ["bench"] as const,
  queues: () => [...benchKeys.all, "queue"] as const,
  queue: (params: QueueQueryInput) => [...benchKeys.queues(), params] as const,
  staff: () => [...benchKeys.all, "staff"] as const,
  job: (jobId: string) => [...benchKeys.all, "job", jobId] as const,
  estimate: (jobId: string) => [...benchKeys.all, "estimate", jobId] as const,
  sheet: (jobId: string) => [...benchKeys.all, "sheet", jobId] as const,
  messages: (jobId: string) => [...benchKeys.all, "messages", jobId] as const,
  partSearch: (q: string) => [...benchKeys.all, "parts", q] as const,
  alignment: (input: unknown) => [...benchKeys.all, "alignment", input] as const,
  customers: (q: string) => [...benchKeys.all, "customers", q] as const,
};
