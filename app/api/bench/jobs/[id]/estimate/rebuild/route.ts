import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { rebuildDraft } from "@/lib/server/services/estimates";
import { rebuildEstimateSchema } from "@/lib/validation/estimate";
import { jobIdFrom } from "../../../../_lib/params";

// POST /api/bench/jobs/:id/estimate/rebuild { version } — replace the draft with the checklist of the current profile.
export const POST = route<{ id: string }, typeof rebuildEstimateSchema>(
  { permission: "estimate.edit", body: rebuildEstimateSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    const { version, priced } = await transaction((ctx) => rebuildDraft(ctx, { jobId, actorId: viewer.id, version: body.version }));
    return { version, totals: priced.totals };
  },
);
