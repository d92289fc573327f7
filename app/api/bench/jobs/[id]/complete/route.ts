import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { completeJob } from "@/lib/server/services/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/complete — refused (409, one field per reason) until every required reading
// passes and every line is ticked; then balance due and the owner is asked to pay.
export const POST = route<{ id: string }>({ permission: "job.complete" }, async ({ params, viewer }) => {
  const jobId = await jobIdFrom(params);
  return transaction((ctx) => completeJob(ctx, { jobId, actorId: viewer.id }));
});
