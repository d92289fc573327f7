import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { closeAccount } from "@/lib/server/services/owner-account";
import { closeAccountSchema } from "@/lib/validation/owner-account";

// POST /api/portal/account/close { password, confirm: true } — refused (409) while a job or a claim is open.
export const POST = route({ permission: "account.manage", body: closeAccountSchema }, async ({ viewer, body }) => {
  await transaction((ctx) => closeAccount(ctx, { ownerId: viewer.id, password: body.password }));
  return { closed: true };
});
