import { route } from "@/lib/server/route-handler";
import { cancelJobByShop } from "@/lib/server/services/cancellations";
import { cancelJobSchema } from "@/lib/validation/cancellation";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/cancel { reason, refund? } — the shop calls a job off before the bench; the answer
// carries the job's account (what is owed back) and the refunds started.
export const POST = route<{ id: string }, typeof cancelJobSchema>(
  { permission: "job.cancel", body: cancelJobSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return cancelJobByShop({ jobId, actorId: viewer.id, reason: body.reason, refund: body.refund });
  },
);
