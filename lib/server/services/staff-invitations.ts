import "server-only";
import { createHash, randomBytes, randomUUID } from "node:crypto";
import { and, count, eq, gt, isNull, sql } from "drizzle-orm";
import { account, certificates, claims, jobs, session, staffInvitation, user } from "@/db/schema";
import { transaction, type TxContext } from "@/db/transaction";
import { ROLE_LABEL } from "@/lib/engine/permissions";
import { audit } from "../audit";
import { env } from "../env";
import { AppError } from "../errors";
import { queueEmail } from "../mail";
import { isCommonPassword } from "../common-passwords";
import { hashPassword } from "../password";

/** How long an invitation link works (once). */
export const INVITATION_DAYS = 7;

const tokenHash = (token: string) => createHash("sha256").update(token).digest("hex");

export type AccountHoldings = { jobs: number; certificates: number; claims: number };

/** What a set owner's account holds, named in the refusal and in the conversion confirmation. */
export async function accountHoldings(ctx: TxContext, userId: string): Promise<AccountHoldings> {
  const [[j], [c], [k]] = await Promise.all([
    ctx.tx.select({ n: count() }).from(jobs).where(eq(jobs.customerId, userId)),
    ctx.tx.select({ n: count() }).from(certificates).where(eq(certificates.customerId, userId)),
    ctx.tx.select({ n: count() }).from(claims).where(eq(claims.claimantId, userId)),
  ]);
  return { jobs: j?.n ?? 0, certificates: c?.n ?? 0, claims: k?.n ?? 0 };
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
export function describeHoldings(h: AccountHoldings): string {
  return `${plural(h.jobs, "job", "jobs")}, ${plural(h.certificates, "certificate", "certificates")} and ${plural(h.claims, "claim", "claims")}`;
}

type InviteInput = { name: string; email: string; role: "technician" | "owner"; convertCustomer?: boolean; holdings?: string };

/**
 * The owner's invite action, the only way an invitation is made. A set owner's e-mail is refused unless the
 * owner converts that account on purpose, confirming what it holds (the confirmation must repeat the
 * holdings as they are now, so a stale screen cannot convert an account that has since gained a job).
 */
export async function inviteStaffMember({ input, actorId }: { input: InviteInput; actorId: string }): Promise<{ userId: string }> {
  const token = randomBytes(32).toString("base64url");
  return transaction(async (ctx) => {
    const [existing] = await ctx.tx.select().from(user).where(eq(user.email, input.email)).limit(1).for("update");
    if (existing && existing.role !== "customer") throw new AppError("conflict", "That person is already on the staff list.");
    let holdings: AccountHoldings | null = null;
    if (existing) {
      holdings = await accountHoldings(ctx, existing.id);
      const named = describeHoldings(holdings);
      if (!input.convertCustomer)
        throw new AppError(
          "conflict",
          `${input.email} belongs to a set owner's account (${named}). Staff and customer accounts are kept apart: invite the person with another e-mail address, or convert this account on purpose.`,
          { email: "This e-mail belongs to a set owner's account.", holdings: named },
        );
      if (input.holdings !== named)
        throw new AppError("stale", `The account now holds ${named}. Check the confirmation again before converting it.`, {
          holdings: named,
        });
    }
    const userId = existing?.id ?? randomUUID();
    if (existing) {
      // Its jobs, certificates and claims keep their rows and their owner: staff reach them on the bench, and
      // the account itself still answers them in the portal (`holdsSets` in lib/server/session.ts).
      await ctx.tx.update(user).set({ role: input.role, updatedAt: new Date() }).where(eq(user.id, userId));
      await ctx.tx.delete(session).where(eq(session.userId, userId));
      // Staff access starts with the invitation, not with the password the set owner chose for the portal:
      // until it is accepted the old password signs in to nothing (accepting sets a new credential).
      await ctx.tx.delete(account).where(and(eq(account.userId, userId), eq(account.providerId, "credential")));
    } else {
      await ctx.tx.insert(user).values({ id: userId, name: input.name, email: input.email, emailVerified: true, role: input.role });
    }
    const invitationId = randomUUID();
    await ctx.tx.insert(staffInvitation).values({
      id: invitationId,
      userId,
      tokenHash: tokenHash(token),
      role: input.role,
      invitedBy: actorId,
      expiresAt: sql`now() + make_interval(days => ${INVITATION_DAYS})`,
    });
    await audit(ctx, {
      actorId,
      action: existing ? "staff.convert_customer" : "staff.invite",
      entity: "user",
      entityId: userId,
      before: existing ? { role: existing.role, holdings } : null,
      after: { role: input.role, email: input.email, invitationId },
    });
    const [inviter] = await ctx.tx.select({ name: user.name }).from(user).where(eq(user.id, actorId));
    await queueEmail(ctx, {
      to: input.email,
      template: "staff-invite",
      props: {
        name: existing?.name ?? input.name,
        url: `${env().APP_URL.replace(/\/$/, "")}/welcome?token=${token}`,
        roleLabel: ROLE_LABEL[input.role],
        invitedBy: inviter?.name ?? "The shop owner",
      },
      dedupeKey: `invite:${invitationId}`,
    });
    return { userId };
  });
}

/** Sets the invited person's password with the invitation's token; the token works once. */
export async function acceptStaffInvitation({
  token,
  password,
}: {
  token: string;
  password: string;
}): Promise<{ userId: string; role: string }> {
  if (isCommonPassword(password))
    throw new AppError("invalid_input", "Some fields need attention.", {
      password: "That password is on the list of the most commonly used passwords. Please choose another.",
    });
  const hashed = await hashPassword(password);
  return transaction(async (ctx) => {
    const [used] = await ctx.tx
      .update(staffInvitation)
      .set({ usedAt: new Date() })
      .where(
        and(eq(staffInvitation.tokenHash, tokenHash(token)), isNull(staffInvitation.usedAt), gt(staffInvitation.expiresAt, sql`now()`)),
      )
      .returning({ id: staffInvitation.id, userId: staffInvitation.userId, role: staffInvitation.role });
    if (!used) throw new AppError("not_found", "This invitation has expired or was already used. Ask the shop owner for a new one.");
    const [credential] = await ctx.tx
      .select({ id: account.id })
      .from(account)
      .where(and(eq(account.userId, used.userId), eq(account.providerId, "credential")));
    if (credential) await ctx.tx.update(account).set({ password: hashed, updatedAt: new Date() }).where(eq(account.id, credential.id));
    else
      await ctx.tx
        .insert(account)
        .values({ id: randomUUID(), accountId: used.userId, providerId: "credential", userId: used.userId, password: hashed });
    await ctx.tx.update(user).set({ emailVerified: true, updatedAt: new Date() }).where(eq(user.id, used.userId));
    await ctx.tx.delete(session).where(eq(session.userId, used.userId));
    await audit(ctx, {
      actorId: used.userId,
      // Customers taken in at the counter are invited with the same single-use tokens (services/intake.ts).
      action: used.role === "customer" ? "customer.invitation_accepted" : "staff.invitation_accepted",
      entity: "user",
      entityId: used.userId,
      after: { invitationId: used.id },
    });
    return { userId: used.userId, role: used.role };
  });
}
