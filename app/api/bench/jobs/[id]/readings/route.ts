import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { saveReading } from "@/lib/server/services/bench";
import { readingInputSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/readings { key, value, note? } — stored with its verdict.
export const POST = route<{ id: string }, typeof readingInputSchema>(
  { permission: "reading.record", body: readingInputSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => saveReading(ctx, { jobId, actorId: viewer.id, input: body }));
  },
);
