import "server-only";
import { listAssignableStaff, listQueueForStaff } from "@/db/queries/bench";
import { queueQuerySchema, type QueueQuery } from "@/lib/validation/bench";
import { INITIAL_QUEUE_PARAMS } from "@/lib/validation/queue-params";

/** One page of the bench queue as the queue route answers it (dates as ISO text). */
export async function queuePage({ query, viewerId }: { query: QueueQuery; viewerId: string }) {
  const { rows, total } = await listQueueForStaff({ query, viewerId });
  return {
    rows: rows.map((r) => ({ ...r, createdAt: r.createdAt.toISOString(), updatedAt: r.updatedAt.toISOString() })),
    total,
    page: query.page,
    pageSize: query.pageSize,
    pageCount: Math.max(1, Math.ceil(total / query.pageSize)),
  };
}

export type QueuePageData = Awaited<ReturnType<typeof queuePage>>;

/** What the queue page shows before any filter is touched, read on the server so the first paint has it. */
export async function initialQueue({ viewerId }: { viewerId: string }) {
  const [queue, staff] = await Promise.all([
    queuePage({ query: queueQuerySchema.parse(INITIAL_QUEUE_PARAMS), viewerId }),
    listAssignableStaff(),
  ]);
  return { queue, staff, readAt: Date.now() };
}
