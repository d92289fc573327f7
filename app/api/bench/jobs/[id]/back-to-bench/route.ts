import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { returnToBench } from "@/lib/server/services/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/back-to-bench — final checks found something (final checks → on the bench).
export const POST = route<{ id: string }>({ permission: "job.complete" }, async ({ params, viewer }) => {
  const jobId = await jobIdFrom(params);
  const { after } = await transaction((ctx) => returnToBench(ctx, { jobId, actorId: viewer.id }));
  return { state: after.state };
});
