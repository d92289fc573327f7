import { route } from "@/lib/server/route-handler";
import { getJobDetail } from "@/lib/server/services/bench";
import { jobIdFrom } from "../../_lib/params";

// GET /api/bench/jobs/:id — the job page's header, triage data, messages, photos and history.
export const GET = route<{ id: string }>({ permission: "bench.use" }, async ({ params }) => {
  const jobId = await jobIdFrom(params);
  return getJobDetail({ jobId });
});
