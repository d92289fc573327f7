import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { updatePerformance } from "@/lib/server/services/performance";
import { performanceUpdateSchema } from "@/lib/validation/performance";
import { jobIdFrom } from "../../../_lib/params";

// PUT /api/bench/jobs/:id/performance { enabled, conditions?, figures? } — the opt-in, conditions and service figures.
export const PUT = route<{ id: string }, typeof performanceUpdateSchema>(
  { permission: "reading.record", body: performanceUpdateSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => updatePerformance(ctx, { jobId, actorId: viewer.id, input: body }));
  },
);
