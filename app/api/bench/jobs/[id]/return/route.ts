import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { recordReturn } from "@/lib/server/services/bench";
import { returnSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/return { method: "pick-up" } | { method: "shipped", carrier, trackingNumber }
export const POST = route<{ id: string }, typeof returnSchema>(
  { permission: "job.return", body: returnSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => recordReturn(ctx, { jobId, actorId: viewer.id, input: body }));
  },
);
