import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { addAddress, listAddresses } from "@/lib/server/services/owner-account";
import { addressSchema } from "@/lib/validation/owner-account";

// GET /api/portal/account/addresses — the owner's address book, the default first.
export const GET = route({ permission: "account.manage" }, async ({ viewer }) => ({
  addresses: await listAddresses({ ownerId: viewer.id }),
}));

// POST /api/portal/account/addresses { recipient, line1, line2?, city, region?, postalCode?, country, isDefault? }
export const POST = route({ permission: "account.manage", body: addressSchema }, async ({ viewer, body }) => {
  const address = await transaction((ctx) => addAddress(ctx, { ownerId: viewer.id, input: body }));
  return new Response(JSON.stringify({ address }), {
    status: 201,
    headers: { "content-type": "application/json; charset=utf-8", "cache-control": "no-store" },
  });
});
