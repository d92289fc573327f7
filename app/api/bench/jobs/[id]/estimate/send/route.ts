import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { sendRevision } from "@/lib/server/services/estimates";
import { expireStaleCheckouts } from "@/lib/server/services/payments";
import { sendEstimateSchema } from "@/lib/validation/estimate";
import { jobIdFrom } from "../../../../_lib/params";

// POST /api/bench/jobs/:id/estimate/send { version, changeSummary? } — revision N+1 to the owner.
export const POST = route<{ id: string }, typeof sendEstimateSchema>(
  { permission: "estimate.send", body: sendEstimateSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    const sent = await transaction((ctx) =>
      sendRevision(ctx, { jobId, actorId: viewer.id, version: body.version, changeSummary: body.changeSummary }),
    );
    // The new revision supersedes every open checkout of the job (after the commit: no network call in it).
    await expireStaleCheckouts(jobId).catch((e: unknown) => console.error("[bandedge] expiring checkouts failed", e));
    return sent;
  },
);
