import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { recordOwnerDecision } from "@/lib/server/services/intake";
import { recordDecisionSchema } from "@/lib/validation/intake";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/decision — the owner's answer to the estimate, given in person, by phone or in
// writing, recorded by staff (who, when and how are kept on the revision and in the audit log).
export const POST = route<{ id: string }, typeof recordDecisionSchema>(
  { permission: "decision.record", body: recordDecisionSchema },
  async ({ params, viewer, body }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) => recordOwnerDecision(ctx, { jobId, input: body, staffId: viewer.id }));
  },
);
