import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db, type Database } from "@/db";
import { emailOutbox, estimates, jobs, payments, radioSets, refunds, shopSettings, user } from "@/db/schema";
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
      timeZone: string;
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
  inFlightMinor: sql<number>`coalesce((select sum(r.amount_minor) from refund r where r.payment_id = ${payments.id} and r.status in ('requested','pending')), 0)::int`,
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
  method: payments.method,
  chequeNumber: payments.chequeNumber,
  receivedOn: payments.receivedOn,
  voidReason: payments.voidReason,
  receiptId: sql<string | null>`(select d.id from money_document d where d.payment_id = ${payments.id} and d.kind = 'receipt')`,
  receiptNumber: sql<string | null>`(select d.number from money_document d where d.payment_id = ${payments.id} and d.kind = 'receipt')`,
  ...refundSums,
};

export const PAYMENTS_PAGE_SIZE = 30;

export async function listPaymentsForOffice({ page = 1, status }: { page?: number; status?: "paid" | "open" | "all" }) {
  const where =
    status === "paid"
      ? sql`${payments.status} in ('paid','duplicate')`
      : status === "open"
        ? sql`${payments.status} in ('open','processing')`
        : undefined;
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
      kind: refunds.kind,
      status: refunds.status,
      createdAt: refunds.createdAt,
      settledAt: refunds.settledAt,
      createdByName: user.name,
      noteId: sql<string | null>`(select d.id from money_document d where d.refund_id = ${refunds.id} and d.kind = 'refund')`,
      noteNumber: sql<string | null>`(select d.number from money_document d where d.refund_id = ${refunds.id} and d.kind = 'refund')`,
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
    .where(and(eq(refunds.paymentId, paymentId), inArray(refunds.status, ["requested", "pending"])));
  return { payment: row, inFlightMinor: sums?.inFlightMinor ?? 0 };
}

export async function insertRefund(
  ctx: TxContext,
  values: {
    id: string;
    paymentId: string;
    amountMinor: number;
    reason: string;
    kind: "return" | "reduction";
    idempotencyKey: string;
    createdBy: string;
  },
) {
  const [row] = await ctx.tx
    .insert(refunds)
    .values({ ...values, status: "requested" })
    .returning();
  return row!;
}

/** Records the processor's id for a refund still waiting for its webhook (the webhook may have come first). */
export async function setRefundProcessorId(
  ctx: TxContext,
  { refundId, processorRefundId }: { refundId: string; processorRefundId: string },
) {
  await ctx.tx
    .update(refunds)
    .set({ processorRefundId })
    .where(and(eq(refunds.id, refundId), sql`${refunds.processorRefundId} is null`));
}

/** Locks a refund row that may still change: one settlement at a time, whoever brings the news. */
export async function lockRefund(ctx: TxContext, { refundId }: { refundId: string }) {
  const [row] = await ctx.tx.select().from(refunds).where(eq(refunds.id, refundId)).for("update").limit(1);
  return row ?? null;
}

/**
 * Settles a refund that is still open (requested or pending) and, when it succeeded, raises the payment's
 * refunded figure in the same statement set, so the refund row and the payment never tell two stories.
 * Null when it was already settled.
 */
export async function settleRefundRow(
  ctx: TxContext,
  { refundId, status, processorRefundId }: { refundId: string; status: "succeeded" | "failed"; processorRefundId: string | null },
) {
  const [row] = await ctx.tx
    .update(refunds)
    .set({ status, settledAt: new Date(), ...(processorRefundId ? { processorRefundId } : {}) })
    .where(and(eq(refunds.id, refundId), inArray(refunds.status, ["requested", "pending"])))
    .returning();
  if (!row) return null;
  if (status === "succeeded") {
    await ctx.tx
      .update(payments)
      .set({
        refundedMinor: sql`greatest(${payments.refundedMinor}, (select coalesce(sum(r.amount_minor), 0) from refund r where r.payment_id = ${payments.id} and r.status = 'succeeded'))::int`,
      })
      .where(eq(payments.id, row.paymentId));
  }
  return row;
}

/** Marks a requested refund pending: the processor's answer is not known (or it answered "pending"). */
export async function markRefundPending(
  ctx: TxContext,
  { refundId, processorRefundId }: { refundId: string; processorRefundId: string | null },
) {
  const [row] = await ctx.tx
    .update(refunds)
    .set({ status: "pending", ...(processorRefundId ? { processorRefundId } : {}) })
    .where(and(eq(refunds.id, refundId), eq(refunds.status, "requested")))
    .returning();
  return row ?? null;
}

export async function getRefundForOffice({ refundId }: { refundId: string }) {
  const [row] = await db.select().from(refunds).where(eq(refunds.id, refundId)).limit(1);
  return row ?? null;
}

export async function getPaymentRowForOffice({ paymentId }: { paymentId: string }) {
  const [row] = await db.select().from(payments).where(eq(payments.id, paymentId)).limit(1);
  return row ?? null;
}

/** Refunds not settled yet, oldest first, with what the office needs to find them. */
export async function listOpenRefundsForOffice({ olderThanSeconds = 0, limit = 50 }: { olderThanSeconds?: number; limit?: number } = {}) {
  return db
    .select({
      id: refunds.id,
      paymentId: refunds.paymentId,
      amountMinor: refunds.amountMinor,
      status: refunds.status,
      reason: refunds.reason,
      createdAt: refunds.createdAt,
      jobNumber: jobs.number,
      customerName: user.name,
    })
    .from(refunds)
    .innerJoin(payments, eq(payments.id, refunds.paymentId))
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(
      and(
        inArray(refunds.status, ["requested", "pending"]),
        sql`${refunds.createdAt} <= now() - make_interval(secs => ${olderThanSeconds})`,
      ),
    )
    .orderBy(asc(refunds.createdAt))
    .limit(limit);
}

// ─── E-mail that could not be sent ───

export async function listFailedEmailsForOffice({ limit = 50 }: { limit?: number } = {}) {
  return db
    .select({
      id: emailOutbox.id,
      toAddress: emailOutbox.toAddress,
      template: emailOutbox.template,
      attempts: emailOutbox.attempts,
      lastError: emailOutbox.lastError,
      createdAt: emailOutbox.createdAt,
    })
    .from(emailOutbox)
    .where(eq(emailOutbox.status, "failed"))
    .orderBy(desc(emailOutbox.createdAt))
    .limit(limit);
}

export async function getOutboxRowForOffice({ outboxId }: { outboxId: string }) {
  const [row] = await db.select().from(emailOutbox).where(eq(emailOutbox.id, outboxId)).limit(1);
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
      (select count(*) from refund where status in ('requested','pending'))::int as refunds_in_flight,
      (select coalesce(sum(amount_minor), 0) from payment where status = 'paid' and paid_at >= date_trunc('month', now()))::int as paid_this_month
  `,
    )
    .then((r) => r.rows);
  return row!;
}
