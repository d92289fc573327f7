import { route } from "@/lib/server/route-handler";
import { getBenchSheet } from "@/lib/server/services/bench";
import { jobIdFrom } from "../../../_lib/params";

// GET /api/bench/jobs/:id/sheet — required readings with values and verdicts, checklist lines, completion gate.
export const GET = route<{ id: string }>({ permission: "bench.use" }, async ({ params }) => {
  const jobId = await jobIdFrom(params);
  return getBenchSheet({ jobId });
});
