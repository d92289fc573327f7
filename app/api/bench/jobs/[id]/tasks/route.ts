import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { setTask } from "@/lib/server/services/bench";
import { taskInputSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/tasks { code, done } — tick a checklist line (who and when are kept).
export const POST = route<{ id: string }, typeof taskInputSchema>(
  { permission: "reading.record", body: taskInputSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => setTask(ctx, { jobId, actorId: viewer.id, code: body.code, done: body.done }));
  },
);
