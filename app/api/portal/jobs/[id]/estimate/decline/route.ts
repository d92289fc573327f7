import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { declineRevision } from "@/lib/server/services/approvals";
import { declineSchema } from "@/lib/validation/quote";
import { idFrom } from "../../../../_lib/ids";

// POST /api/portal/jobs/:id/estimate/decline { revisionId, reason }
export const POST = route<{ id: string }, typeof declineSchema>(
  { permission: "estimate.approve", body: declineSchema },
  async ({ viewer, params, body }) => {
    const jobId = idFrom(params.id);
    return transaction((ctx) =>
      declineRevision(ctx, {
        jobId,
        customerId: viewer.id,
        revisionId: body.revisionId,
        reason: body.reason,
        afterDecline: body.afterDecline,
      }),
    );
  },
);
