"use server";

import { revalidatePath } from "next/cache";
import { getUserById, setUserActive, setUserRole } from "@/db/queries/staff";
import { transaction } from "@/db/transaction";
import { action } from "@/lib/server/server-action";
import { audit } from "@/lib/server/audit";
import { queueStaffAccessNotice } from "@/lib/server/services/notices";
import { inviteStaffMember } from "@/lib/server/services/staff-invitations";
import { AppError } from "@/lib/server/errors";
import { staffDeactivateSchema, staffInviteSchema, staffRoleSchema } from "@/lib/validation/account";

export const inviteStaff = action("staff.manage", staffInviteSchema, async (input, viewer) => {
  const result = await inviteStaffMember({ input, actorId: viewer.id });
  revalidatePath("/office/staff");
  return result;
});

export const changeStaffRole = action("staff.manage", staffRoleSchema, async (input, viewer) => {
  if (input.userId === viewer.id) throw new AppError("conflict", "You cannot change your own role.");
  await transaction(async (ctx) => {
    const target = await getUserById(ctx, { userId: input.userId });
    if (!target) throw new AppError("not_found", "That account was not found.");
    // A set owner becomes staff only through the invitation, which names what the account holds.
    if (target.role === "customer" && input.role !== "customer")
      throw new AppError("conflict", "A set owner's account becomes staff only through an invitation with its confirmation.");
    await setUserRole(ctx, { userId: input.userId, role: input.role });
    await audit(ctx, {
      actorId: viewer.id,
      action: "staff.role",
      entity: "user",
      entityId: input.userId,
      before: { role: target.role },
      after: { role: input.role },
    });
  });
  revalidatePath("/office/staff");
  return { ok: true };
});

export const setStaffActive = action("staff.manage", staffDeactivateSchema, async (input, viewer) => {
  if (input.userId === viewer.id) throw new AppError("conflict", "You cannot deactivate your own account.");
  await transaction(async (ctx) => {
    const target = await getUserById(ctx, { userId: input.userId });
    if (!target) throw new AppError("not_found", "That account was not found.");
    await setUserActive(ctx, { userId: input.userId, active: input.active });
    await audit(ctx, {
      actorId: viewer.id,
      action: input.active ? "staff.reactivate" : "staff.deactivate",
      entity: "user",
      entityId: input.userId,
      before: { banned: !!target.banned },
      after: { banned: !input.active },
    });
    await queueStaffAccessNotice(ctx, { userId: input.userId, active: input.active });
  });
  revalidatePath("/office/staff");
  return { ok: true };
});
