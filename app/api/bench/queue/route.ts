import { listQueueForStaff } from "@/db/queries/bench";
import { route } from "@/lib/api";
import { AppError } from "@/lib/errors";
import { zodFields } from "@/lib/api";
import { queueQuerySchema } from "@/lib/validation/bench";

// GET /api/bench/queue?page=1&pageSize=25&sort=updatedAt&dir=desc&states=in_triage,on_bench&technician=me&q=KL-0042
export const GET = route({ permission: "bench.use" }, async ({ request, viewer }) => {
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const parsed = queueQuerySchema.safeParse(params);
  if (!parsed.success) throw new AppError("invalid_input", "The queue filter is not valid.", zodFields(parsed.error));
  const { rows, total } = await listQueueForStaff({ query: parsed.data, viewerId: viewer.id });
  return {
    rows: rows.map((r) => ({ ...r, createdAt: r.createdAt.toISOString(), updatedAt: r.updatedAt.toISOString() })),
    total,
    page: parsed.data.page,
    pageSize: parsed.data.pageSize,
    pageCount: Math.max(1, Math.ceil(total / parsed.data.pageSize)),
  };
});
