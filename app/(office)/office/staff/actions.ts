"use server";

import { randomUUID } from "node:crypto";
import { revalidatePath } from "next/cache";
import { getUserById, getUserByEmail, setUserActive, setUserRole } from "@/db/queries/staff";
import { user } from "@/db/schema";
import { transaction } from "@/db/transaction";
import { action } from "@/lib/server/server-action";
import { audit } from "@/lib/server/audit";
import { auth } from "@/lib/server/auth";
import { AppError } from "@/lib/server/errors";
import { staffDeactivateSchema, staffInviteSchema, staffRoleSchema } from "@/lib/validation/account";

export const inviteStaff = action("staff.manage", staffInviteSchema, async (input, viewer) => {
  const existing = await getUserByEmail({ email: input.email });
  if (existing && existing.role !== "customer") throw new AppError("conflict", "That person is already on the staff list.");
  const userId = existing?.id ?? randomUUID();
  await transaction(async (ctx) => {
    if (existing) {
      await setUserRole(ctx, { userId, role: input.role });
    } else {
      await ctx.tx.insert(user).values({ id: userId, name: input.name, email: input.email, emailVerified: true, role: input.role });
    }
    await audit(ctx, {
      actorId: viewer.id,
      action: "staff.invite",
      entity: "user",
      entityId: userId,
      before: existing ? { role: existing.role } : null,
      after: { role: input.role, email: input.email },
    });
  });
  // The welcome link is a password-setting link; the mail template says it is an invitation.
  await auth().api.requestPasswordReset({ body: { email: input.email, redirectTo: "/reset-password?welcome=1" } });
  revalidatePath("/office/staff");
  return { userId };
});

export const changeStaffRole = action("staff.manage", staffRoleSchema, async (input, viewer) => {
  if (input.userId === viewer.id) throw new AppError("conflict", "You cannot change your own role.");
  await transaction(async (ctx) => {
    const target = await getUserById(ctx, { userId: input.userId });
    if (!target) throw new AppError("not_found", "That account was not found.");
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
  });
  revalidatePath("/office/staff");
  return { ok: true };
});
