import type { JobState } from "./states";

// What the bench queue can be asked: the checked form of its query string (lib/validation/bench.ts parses it).

export const QUEUE_SORTS = ["number", "updatedAt", "createdAt", "state", "customer", "set", "technician"] as const;
export type QueueSort = (typeof QUEUE_SORTS)[number];

export type QueueQuery = {
  page: number;
  pageSize: number;
  sort: QueueSort;
  dir: "asc" | "desc";
  /** Empty means the open states. */
  states: JobState[];
  /** "me", "none", a technician's id, or empty for everyone. */
  technician: string;
  q: string;
  includeClosed: boolean;
};

/** "KL-0042", "kl42", "42" → 42; anything else → null. */
export function parseJobNumber(q: string): number | null {
  const m = /^(?:KL-?)?0*(\d{1,7})$/i.exec(q.trim());
  return m ? Number(m[1]) : null;
}
