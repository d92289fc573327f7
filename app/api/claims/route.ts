import { listClaimsForClaimant } from "@/db/queries/claims";
import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { claimSummary, openClaim } from "@/lib/server/services/claims";
import { openClaimSchema } from "@/lib/validation/claims";

export const GET = route({ permission: "claim.open" }, async ({ viewer }) => {
  const rows = await listClaimsForClaimant({ claimantId: viewer.id });
  return { claims: rows.map(claimSummary) };
});

// The holder opens a claim from one of their own certificates.
export const POST = route({ permission: "claim.open", body: openClaimSchema }, async ({ viewer, body }) => {
  const claim = await transaction((ctx) => openClaim(ctx, { ...body, claimantId: viewer.id }), { retries: 0 });
  return Response.json({ claim: { id: claim.id, status: claim.status } }, { status: 201, headers: { "cache-control": "no-store" } });
});
