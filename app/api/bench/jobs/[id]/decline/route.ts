import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { declineJob } from "@/lib/server/services/bench";
import { declineSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/decline { reason }
export const POST = route<{ id: string }, typeof declineSchema>(
  { permission: "job.triage", body: declineSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    const { after } = await transaction((ctx) => declineJob(ctx, { jobId, actorId: viewer.id, reason: body.reason }));
    return { state: after.state };
  },
);
