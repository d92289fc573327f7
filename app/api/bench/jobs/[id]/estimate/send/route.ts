import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { sendRevision } from "@/lib/server/services/estimates";
import { sendEstimateSchema } from "@/lib/validation/estimate";
import { jobIdFrom } from "../../../../_lib/params";

// POST /api/bench/jobs/:id/estimate/send { version, changeSummary? } — revision N+1 to the owner.
export const POST = route<{ id: string }, typeof sendEstimateSchema>(
  { permission: "estimate.send", body: sendEstimateSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => sendRevision(ctx, { jobId, actorId: viewer.id, version: body.version, changeSummary: body.changeSummary }));
  },
);
