import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { startTriage } from "@/lib/server/services/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/triage — pick up a new request (requested → in triage).
export const POST = route<{ id: string }>({ permission: "job.triage" }, async ({ params, viewer }) => {
  const jobId = await jobIdFrom(params);
  const { after } = await transaction((ctx) => startTriage(ctx, { jobId, actorId: viewer.id }));
  return { state: after.state };
});
