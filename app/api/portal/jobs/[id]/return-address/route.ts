import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { chooseReturnAddress } from "@/lib/server/services/owner-account";
import { chooseReturnAddressSchema } from "@/lib/validation/owner-account";
import { idFrom } from "../../../_lib/ids";

// PUT /api/portal/jobs/:id/return-address { addressId } — the job keeps a copy of the address as it is now.
export const PUT = route<{ id: string }, typeof chooseReturnAddressSchema>(
  { permission: "account.manage", body: chooseReturnAddressSchema },
  async ({ viewer, params, body }) => {
    const jobId = idFrom(params.id);
    return transaction((ctx) => chooseReturnAddress(ctx, { ownerId: viewer.id, jobId, addressId: body.addressId }));
  },
);
