import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { approveRevision } from "@/lib/server/services/approvals";
import { approveSchema } from "@/lib/validation/quote";
import { idFrom } from "../../../../_lib/ids";

// POST /api/portal/jobs/:id/estimate/approve { revisionId } — only the revision the owner is looking at.
export const POST = route<{ id: string }, typeof approveSchema>(
  { permission: "estimate.approve", body: approveSchema },
  async ({ viewer, params, body }) => {
    const jobId = idFrom(params.id);
    return transaction((ctx) => approveRevision(ctx, { jobId, customerId: viewer.id, revisionId: body.revisionId }));
  },
);
