import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { savePassbandSweep } from "@/lib/server/services/performance";
import { passbandSweepInputSchema } from "@/lib/validation/performance";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/passband { curve, ifKHz, method, points } — one IF strip's sweep, read by the engine.
export const POST = route<{ id: string }, typeof passbandSweepInputSchema>(
  { permission: "reading.record", body: passbandSweepInputSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => savePassbandSweep(ctx, { jobId, actorId: viewer.id, input: body }));
  },
);
