import { asc, eq, inArray } from "drizzle-orm";
import { db } from "@/db";
import { session, user } from "@/db/schema";
import type { Role } from "@/db/schema/enums";
import type { TxContext } from "@/db/transaction";

export async function listStaff() {
  return db
    .select({ id: user.id, name: user.name, email: user.email, role: user.role, banned: user.banned, createdAt: user.createdAt })
    .from(user)
    .where(inArray(user.role, ["technician", "owner"]))
    .orderBy(asc(user.name));
}

export async function listTechnicians() {
  return db
    .select({ id: user.id, name: user.name })
    .from(user)
    .where(inArray(user.role, ["technician", "owner"]))
    .orderBy(asc(user.name));
}

export async function getUserById(ctx: TxContext, { userId }: { userId: string }) {
  const [row] = await ctx.tx.select().from(user).where(eq(user.id, userId)).limit(1);
  return row ?? null;
}

export async function getUserByEmail({ email }: { email: string }) {
  const [row] = await db.select().from(user).where(eq(user.email, email)).limit(1);
  return row ?? null;
}

// Role changes and deactivation end every session of the person at once.
export async function setUserRole(ctx: TxContext, { userId, role }: { userId: string; role: Role }) {
  await ctx.tx.update(user).set({ role, updatedAt: new Date() }).where(eq(user.id, userId));
  await ctx.tx.delete(session).where(eq(session.userId, userId));
}

export async function setUserActive(ctx: TxContext, { userId, active }: { userId: string; active: boolean }) {
  await ctx.tx
    .update(user)
    .set({ banned: !active, banReason: active ? null : "Deactivated by the shop owner", updatedAt: new Date() })
    .where(eq(user.id, userId));
  if (!active) await ctx.tx.delete(session).where(eq(session.userId, userId));
}
