import { route } from "@/lib/server/route-handler";
import { getBenchSheet } from "@/lib/server/services/bench";
import { jobIdFrom } from "../../../_lib/params";

// GET /api/bench/jobs/:id/sheet — required readings with values and verdicts in both phases, the instruments
// on offer with the viewer's last choice per kind, checklist lines, completion gate.
export const GET = route<{ id: string }>({ permission: "bench.use" }, async ({ params, viewer }) => {
  const jobId = await jobIdFrom(params);
  return getBenchSheet({ jobId, viewerId: viewer.id });
});
