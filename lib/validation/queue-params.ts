import type { QueueQueryInput } from "./bench";

// Kept apart from the queue schema so the queue page can read it without loading the schema library.
/** The queue as it first opens: newest change first, open jobs, everyone's. Same key order as the table's. */
export const INITIAL_QUEUE_PARAMS = {
  page: 1,
  pageSize: 25,
  sort: "updatedAt",
  dir: "desc",
  states: "",
  includeClosed: "0",
  technician: "",
  q: "",
} as const satisfies QueueQueryInput;
