import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { removeAddress, updateAddress } from "@/lib/server/services/owner-account";
import { addressSchema } from "@/lib/validation/owner-account";
import { idFrom } from "../../../_lib/ids";

// PATCH /api/portal/account/addresses/:id — the whole address again; someone else's answers 404.
export const PATCH = route<{ id: string }, typeof addressSchema>(
  { permission: "account.manage", body: addressSchema },
  async ({ viewer, params, body }) => {
    const addressId = idFrom(params.id, "That address");
    return { address: await transaction((ctx) => updateAddress(ctx, { ownerId: viewer.id, addressId, input: body })) };
  },
);

// DELETE /api/portal/account/addresses/:id — jobs keep their own copy of the address they ship to.
export const DELETE = route<{ id: string }>({ permission: "account.manage" }, async ({ viewer, params }) => {
  const addressId = idFrom(params.id, "That address");
  await transaction((ctx) => removeAddress(ctx, { ownerId: viewer.id, addressId }));
  return { ok: true };
});
