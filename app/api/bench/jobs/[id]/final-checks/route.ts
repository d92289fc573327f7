import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { beginFinalChecks } from "@/lib/server/services/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/final-checks — every line ticked (on the bench → final checks).
export const POST = route<{ id: string }>({ permission: "job.complete" }, async ({ params, viewer }) => {
  const jobId = await jobIdFrom(params);
  const { after } = await transaction((ctx) => beginFinalChecks(ctx, { jobId, actorId: viewer.id }));
  return { state: after.state };
});
