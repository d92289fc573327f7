import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { updateProfile } from "@/lib/server/services/bench";
import { profileUpdateSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// PUT /api/bench/jobs/:id/profile { maker, model, year, profile } — the set profile that drives the checklist.
export const PUT = route<{ id: string }, typeof profileUpdateSchema>(
  { permission: "job.triage", body: profileUpdateSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => updateProfile(ctx, { jobId, actorId: viewer.id, input: body }));
  },
);
