import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { assignTechnician } from "@/lib/server/services/bench";
import { assignSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/assign { technicianId: string | null }
export const POST = route<{ id: string }, typeof assignSchema>(
  { permission: "job.assign", body: assignSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => assignTechnician(ctx, { jobId, actorId: viewer.id, technicianId: body.technicianId }));
  },
);
