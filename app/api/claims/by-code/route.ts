import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { openClaim } from "@/lib/server/services/claims";
import { openClaimByCodeSchema } from "@/lib/validation/claims";

// A later owner (or the holder) opens a claim with the code printed on the certificate, where the terms allow.
export const POST = route({ permission: "claim.open", body: openClaimByCodeSchema }, async ({ viewer, body }) => {
  const claim = await transaction((ctx) => openClaim(ctx, { ...body, claimantId: viewer.id }), { retries: 0 });
  return Response.json({ claim: { id: claim.id, status: claim.status } }, { status: 201, headers: { "cache-control": "no-store" } });
});
