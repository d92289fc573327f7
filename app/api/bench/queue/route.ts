import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { queuePage } from "@/lib/server/services/bench-queue";
import { zodFields } from "@/lib/server/route-handler";
import { queueQuerySchema } from "@/lib/validation/bench";

// GET /api/bench/queue?page=1&pageSize=25&sort=updatedAt&dir=desc&states=in_triage,on_bench&technician=me&q=KL-0042
export const GET = route({ permission: "bench.use" }, async ({ request, viewer }) => {
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const parsed = queueQuerySchema.safeParse(params);
  if (!parsed.success) throw new AppError("invalid_input", "The queue filter is not valid.", zodFields(parsed.error));
  return queuePage({ query: parsed.data, viewerId: viewer.id });
});
