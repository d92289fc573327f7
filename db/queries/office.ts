import { and, desc, eq, sql } from "drizzle-orm";
import { db, type Database } from "@/db";
import { estimates, jobs, payments, radioSets, refunds, shopSettings, user } from "@/db/schema";
import type { TxContext } from "@/db/transaction";

// ─── Shop settings ───

export async function getShopSettingsRowForOwner({ tx = db, lock = false }: { tx?: Database; lock?: boolean } = {}) {
  const q = tx.select().from(shopSettings).where(eq(shopSettings.id, "shop")).limit(1);
  const [row] = lock ? await q.for("update") : await q;
  return row ?? null;
}

/** Jobs whose estimate is still open: priced in the shop's currency and not yet settled or closed. */
export async function countOpenEstimatesForOwner({ tx = db }: { tx?: Database } = {}): Promise<number> {
  const [row] = await tx
    .select({ n: sql<number>`count(*)::int` })
    .from(estimates)
    .innerJoin(jobs, eq(jobs.id, estimates.jobId))
    .where(sql`${jobs.state} not in ('paid_in_full', 'returned', 'declined_by_owner', 'declined_by_shop', 'cancelled')`);
  return row?.n ?? 0;
}

export async function getSettingsEditorForOwner({ userId }: { userId: string | null }) {
  if (!userId) return null;
  const [row] = await db.select({ name: user.name }).from(user).where(eq(user.id, userId)).limit(1);
  return row?.name ?? null;
}

/** Writes only when the stored version is the one the editor started from; null means someone saved first. */
export async function updateShopSettingsIfVersion(
  ctx: TxContext,
  {
    expectedVersion,
    values,
    actorId,
  }: {
    expectedVersion: number;
    values: {
      name: string;
      addressLines: string[];
      phone: string;
      email: string;
      policy: Record<string, unknown>;
      warrantyTerms: Record<string, unknown>;
    };
    actorId: string;
  },
) {
  const [row] = await ctx.tx
    .update(shopSettings)
    .set({ ...values, version: sql`${shopSettings.version} + 1`, updatedAt: new Date(), updatedBy: actorId })
    .where(and(eq(shopSettings.id, "shop"), eq(shopSettings.version, expectedVersion)))
    .returning();
  return row ?? null;
}

// ─── Payments and refunds ───

const refundSums = {
  inFlightMinor: sql<number>`coalesce((select sum(r.amount_minor) from refund r where r.payment_id = ${payments.id} and r.status = 'requested'), 0)::int`,
  refundCount: sql<number>`(select count(*) from refund r where r.payment_id = ${payments.id})::int`,
};

const paymentColumns = {
  id: payments.id,
  jobId: payments.jobId,
  jobNumber: jobs.number,
  maker: radioSets.maker,
  model: radioSets.model,
  customerName: user.name,
  purpose: payments.purpose,
  amountMinor: payments.amountMinor,
  currency: payments.currency,
  status: payments.status,
  paidAt: payments.paidAt,
  createdAt: payments.createdAt,
  refundedMinor: payments.refundedMinor,
  paymentIntentId: payments.paymentIntentId,
  ...refundSums,
};

export const PAYMENTS_PAGE_SIZE = 30;

export async function listPaymentsForOffice({ page = 1, status }: { page?: number; status?: "paid" | "open" | "all" }) {
  const where =
    status === "paid" ? eq(payments.status, "paid") : status === "open" ? sql`${payments.status} in ('open','processing')` : undefined;
  const rows = await db
    .select(paymentColumns)
    .from(payments)
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(where)
    .orderBy(sql`${payments.paidAt} desc nulls last`, desc(payments.createdAt))
    .limit(PAYMENTS_PAGE_SIZE + 1)
    .offset((page - 1) * PAYMENTS_PAGE_SIZE);
  return { rows: rows.slice(0, PAYMENTS_PAGE_SIZE), hasMore: rows.length > PAYMENTS_PAGE_SIZE };
}

export async function getPaymentForOffice({ paymentId }: { paymentId: string }) {
  const [row] = await db
    .select(paymentColumns)
    .from(payments)
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(eq(payments.id, paymentId))
    .limit(1);
  if (!row) return null;
  const refundRows = await db
    .select({
      id: refunds.id,
      amountMinor: refunds.amountMinor,
      reason: refunds.reason,
      status: refunds.status,
      createdAt: refunds.createdAt,
      settledAt: refunds.settledAt,
      createdByName: user.name,
    })
    .from(refunds)
    .leftJoin(user, eq(user.id, refunds.createdBy))
    .where(eq(refunds.paymentId, paymentId))
    .orderBy(desc(refunds.createdAt));
  return { ...row, refunds: refundRows };
}

/** Locks the payment row: two refunds of one payment are decided one after the other. */
export async function lockPaymentForRefund(ctx: TxContext, { paymentId }: { paymentId: string }) {
  const [row] = await ctx.tx.select().from(payments).where(eq(payments.id, paymentId)).for("update").limit(1);
  if (!row) return null;
  const [sums] = await ctx.tx
    .select({ inFlightMinor: sql<number>`coalesce(sum(${refunds.amountMinor}), 0)::int` })
    .from(refunds)
    .where(and(eq(refunds.paymentId, paymentId), eq(refunds.status, "requested")));
  return { payment: row, inFlightMinor: sums?.inFlightMinor ?? 0 };
}

export async function insertRefund(
  ctx: TxContext,
  values: { id: string; paymentId: string; amountMinor: number; reason: string; idempotencyKey: string; createdBy: string },
) {
  const [row] = await ctx.tx
    .insert(refunds)
    .values({ ...values, status: "requested" })
    .returning();
  return row!;
}

/** Records the processor's id for a refund still waiting for its webhook (the webhook may have come first). */
export async function setRefundProcessorId({ refundId, processorRefundId }: { refundId: string; processorRefundId: string }) {
  await db
    .update(refunds)
    .set({ processorRefundId })
    .where(and(eq(refunds.id, refundId), sql`${refunds.processorRefundId} is null`));
}

/** Marks a refund failed only while it is still requested: a webhook that already settled it wins. */
export async function markRefundFailed(ctx: TxContext, { refundId }: { refundId: string }) {
  const [row] = await ctx.tx
    .update(refunds)
    .set({ status: "failed", settledAt: new Date() })
    .where(and(eq(refunds.id, refundId), eq(refunds.status, "requested")))
    .returning();
  return row ?? null;
}

export async function getRefundForOffice({ refundId }: { refundId: string }) {
  const [row] = await db.select().from(refunds).where(eq(refunds.id, refundId)).limit(1);
  return row ?? null;
}

// ─── Overview figures ───

export async function officeOverviewFigures() {
  const [row] = await db
    .execute<{
      open_jobs: number;
      on_bench: number;
      balance_due: number;
      technicians: number;
      refunds_in_flight: number;
      paid_this_month: number;
    }>(
      sql`
    select
      (select count(*) from job where state not in ('returned','declined_by_owner','declined_by_shop','cancelled'))::int as open_jobs,
      (select count(*) from job where state = 'on_bench')::int as on_bench,
      (select count(*) from job where state = 'balance_due')::int as balance_due,
      (select count(*) from "user" where role = 'technician' and coalesce(banned, false) = false)::int as technicians,
      (select count(*) from refund where status = 'requested')::int as refunds_in_flight,
      (select coalesce(sum(amount_minor), 0) from payment where status = 'paid' and paid_at >= date_trunc('month', now()))::int as paid_this_month
  `,
    )
    .then((r) => r.rows);
  return row!;
}
