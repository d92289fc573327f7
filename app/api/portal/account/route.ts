import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { getOwnerAccount, updateProfile } from "@/lib/server/services/owner-account";
import { profileSchema } from "@/lib/validation/owner-account";

// GET /api/portal/account — the owner's profile, addresses and what would keep the account from closing.
export const GET = route({ permission: "account.manage" }, async ({ viewer }) => getOwnerAccount({ ownerId: viewer.id }));

// PATCH /api/portal/account { name, phone, contactPreference }
export const PATCH = route({ permission: "account.manage", body: profileSchema }, async ({ viewer, body }) => {
  await transaction((ctx) => updateProfile(ctx, { ownerId: viewer.id, input: body }));
  return getOwnerAccount({ ownerId: viewer.id });
});
