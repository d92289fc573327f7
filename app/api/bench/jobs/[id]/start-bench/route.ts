import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { startBenchWork } from "@/lib/server/services/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/start-bench — the set has arrived (deposit paid → on the bench).
export const POST = route<{ id: string }>({ permission: "reading.record" }, async ({ params, viewer }) => {
  const jobId = await jobIdFrom(params);
  const { after } = await transaction((ctx) => startBenchWork(ctx, { jobId, actorId: viewer.id }));
  return { state: after.state };
});
