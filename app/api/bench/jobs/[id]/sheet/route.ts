import { route } from "@/lib/api";
import { getBenchSheet } from "@/lib/services/bench";
import { jobIdFrom } from "../../../_lib/params";

// GET /api/bench/jobs/:id/sheet — required readings with values and verdicts, checklist lines, completion gate.
export const GET = route<{ id: string }>({ permission: "bench.use" }, async ({ params }) => {
  const jobId = await jobIdFrom(params);
  return getBenchSheet({ jobId });
});
