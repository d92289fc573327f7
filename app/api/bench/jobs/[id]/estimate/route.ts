import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { getEstimateView, saveDraft } from "@/lib/server/services/estimates";
import { saveEstimateSchema } from "@/lib/validation/estimate";
import { jobIdFrom } from "../../../_lib/params";

// GET /api/bench/jobs/:id/estimate — the draft (saved, or computed from the profile), priced, with revisions.
export const GET = route<{ id: string }>({ permission: "estimate.edit" }, async ({ params }) => {
  const jobId = await jobIdFrom(params);
  return getEstimateView({ jobId });
});

// PUT /api/bench/jobs/:id/estimate { version, lines } — 409 "stale" when someone saved since `version`.
export const PUT = route<{ id: string }, typeof saveEstimateSchema>(
  { permission: "estimate.edit", body: saveEstimateSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    const { version, priced } = await transaction((ctx) =>
      saveDraft(ctx, { jobId, actorId: viewer.id, version: body.version, lines: body.lines }),
    );
    return { version, totals: priced.totals };
  },
);
