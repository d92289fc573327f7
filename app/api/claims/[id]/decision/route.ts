import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { isUuid } from "@/lib/server/services/certificates";
import { decideClaim } from "@/lib/server/services/claims";
import { decideClaimSchema } from "@/lib/validation/claims";

export const POST = route<{ id: string }, typeof decideClaimSchema>(
  { permission: "claim.decide", body: decideClaimSchema },
  async ({ viewer, params, body }) => {
    if (!isUuid(params.id)) throw new AppError("not_found", "That claim was not found.");
    const { claim, warrantyJobId } = await transaction((ctx) => decideClaim(ctx, { claimId: params.id, actorId: viewer.id, ...body }));
    return { claim: { id: claim.id, status: claim.status }, warrantyJobId };
  },
);
