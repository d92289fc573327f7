import "server-only";
import { randomUUID } from "node:crypto";
import Stripe from "stripe";
import {
  getPaymentRowForOffice,
  getRefundForOffice,
  insertRefund,
  listOpenRefundsForOffice,
  lockPaymentForRefund,
  lockRefund,
  markRefundPending,
  setRefundProcessorId,
  settleRefundRow,
} from "@/db/queries/office";
import { transaction, type TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { isEngineError } from "@/lib/engine/engine-error";
import { AppError } from "@/lib/server/errors";
import { stripe } from "@/lib/server/payments";
import { formatMinor, toMinor } from "@/lib/engine/pricing/money";
import { issueRefundNote } from "@/lib/server/services/document-numbers";
import { queueRefundNotice } from "@/lib/server/services/notices";
import { getShop } from "@/lib/server/services/shop";
import { notifyStaff } from "@/lib/server/services/notifications";
import { jobNumber } from "@/lib/engine/jobs/states";
import { jobs, payments, radioSets, refunds } from "@/db/schema";
import { eq } from "drizzle-orm";
import type { RefundFormInput } from "@/lib/validation/office";
import { loadJobAccount } from "@/lib/server/services/account";

export type RefundOutcome = {
  refundId: string;
  amountMinor: number;
  /** requested: asked, waiting for the processor's word; pending: asked, outcome not known yet. */
  status: "requested" | "pending" | "succeeded" | "failed";
};

/** Payments whose money the processor holds and can give back: received ones, and duplicate charges. */
const REFUNDABLE = new Set(["paid", "duplicate"]);

function money(amountMinor: number, exponent: number, code: string) {
  return `${code} ${formatMinor(amountMinor, exponent)}`;
}

/**
 * Asks the processor to refund part or all of a received payment (or of a duplicate charge).
 *
 * The payment row is locked while the amount is checked and the refund row (status "requested", our own
 * idempotency key) is written, so two refunds at once can never add up to more than was paid: an unsettled
 * refund counts against what is left until it is settled. The processor call happens after the commit.
 * A clear answer settles the refund at once; a refusal marks it failed ("nothing was refunded"); no answer
 * (a time-out, a dropped connection, a server error) leaves it pending, because the processor may have made
 * it: the webhook, the office's "check with the processor" or the background sweep then settles it, always
 * with the same idempotency key, so a retry can never refund twice.
 */
export async function requestRefund({
  paymentId,
  input,
  actorId,
}: {
  paymentId: string;
  input: RefundFormInput;
  actorId: string;
}): Promise<RefundOutcome> {
  const kind = input.kind ?? "return";
  const shop = await getShop();
  const { exponent, code } = shop.policy.currency;
  let amountMinor: number;
  try {
    amountMinor = toMinor(input.amount, exponent, "amount");
  } catch (e) {
    if (isEngineError(e)) throw new AppError("invalid_input", "Some fields need attention.", { amount: e.message });
    throw e;
  }
  if (amountMinor <= 0) throw new AppError("invalid_input", "Some fields need attention.", { amount: "A refund must be more than zero." });

  const refundId = randomUUID();
  const idempotencyKey = `refund-${refundId}`;
  const payment = await transaction(async (ctx) => {
    // A reduction is checked against the job's price: the job row is locked before the payment row, so two
    // reductions at once on the same job (even on different payments) cannot together take the price below zero.
    let priceLeftMinor: number | null = null;
    if (kind === "reduction") {
      const [owner] = await ctx.tx.select({ jobId: payments.jobId }).from(payments).where(eq(payments.id, paymentId)).limit(1);
      if (owner) {
        await ctx.tx.select({ id: jobs.id }).from(jobs).where(eq(jobs.id, owner.jobId)).for("update").limit(1);
        const { account } = await loadJobAccount(ctx.tx, owner.jobId);
        priceLeftMinor = account.totalMinor - account.waivedMinor - account.reducedMinor;
      }
    }
    const locked = await lockPaymentForRefund(ctx, { paymentId });
    if (!locked) throw new AppError("not_found", "That payment was not found.");
    const { payment: p, inFlightMinor } = locked;
    if (!REFUNDABLE.has(p.status) || !p.paymentIntentId)
      throw new AppError("conflict", "Only a payment that has been received can be refunded.");
    const left = p.amountMinor - p.refundedMinor - inFlightMinor;
    if (amountMinor > left) {
      const pending = inFlightMinor > 0 ? ` (${money(inFlightMinor, exponent, code)} of refunds are still waiting for the processor)` : "";
      throw new AppError(
        "conflict",
        left <= 0
          ? `Nothing is left to refund on this payment${pending}.`
          : `At most ${money(left, exponent, code)} can be refunded on this payment${pending}.`,
        { amount: `At most ${formatMinor(Math.max(left, 0), exponent)}.` },
      );
    }
    if (priceLeftMinor !== null && amountMinor > priceLeftMinor) {
      const allowed = Math.max(priceLeftMinor, 0);
      throw new AppError(
        "conflict",
        allowed === 0
          ? "The price of this job is already zero: it cannot be lowered further. Money paid beyond it goes back as a return."
          : `A price reduction can lower the price by at most ${money(allowed, exponent, code)}, what is left of it; money paid beyond the total goes back as a return.`,
        { amount: `Amount: a price reduction can be at most ${formatMinor(allowed, exponent)}, what is left of the price.` },
      );
    }
    await insertRefund(ctx, { id: refundId, paymentId, amountMinor, reason: input.reason, kind, idempotencyKey, createdBy: actorId });
    await audit(ctx, {
      actorId,
      action: "refund.request",
      entity: "payment",
      entityId: paymentId,
      before: { refundedMinor: p.refundedMinor, inFlightMinor },
      after: {
        refundId,
        amountMinor,
        reason: input.reason,
        kind,
        status: "requested",
        ...(p.status === "duplicate" ? { duplicate: true } : {}),
      },
    });
    await queueRefundNotice(ctx, { paymentId, refundId, amountMinor, kind });
    return p;
  });

  const status = await askProcessor({
    refundId,
    paymentId,
    paymentIntentId: payment.paymentIntentId!,
    jobId: payment.jobId,
    amountMinor,
    idempotencyKey,
    actorId,
  });
  if (status === "failed") {
    throw new AppError("conflict", "The payment processor refused this refund. Nothing was refunded; check the amount and try again.");
  }
  return { refundId, amountMinor, status };
}

/**
 * One create call with the refund's own idempotency key (the first, or a retry: the processor answers a repeat
 * with the refund it already made), and what its answer means for our row.
 */
async function askProcessor(args: {
  refundId: string;
  paymentId: string;
  paymentIntentId: string;
  jobId: string;
  amountMinor: number;
  idempotencyKey: string;
  actorId: string | null;
}): Promise<RefundOutcome["status"]> {
  let result: Stripe.Refund;
  try {
    result = await stripe().refunds.create(
      {
        payment_intent: args.paymentIntentId,
        amount: args.amountMinor,
        metadata: { refundId: args.refundId, paymentId: args.paymentId, jobId: args.jobId },
      },
      { idempotencyKey: args.idempotencyKey },
    );
  } catch (e) {
    const why = e instanceof Stripe.errors.StripeError ? `${e.type}${e.code ? ` ${e.code}` : ""}` : "no answer";
    // A refusal of the request itself is definite: nothing was refunded.
    if (e instanceof Stripe.errors.StripeInvalidRequestError || e instanceof Stripe.errors.StripeCardError) {
      return applyAnswer({ ...args, status: "failed", processorRefundId: null, why });
    }
    // Anything else (time-out, dropped connection, server error) leaves the outcome unknown.
    console.error("[bandedge] refund outcome unknown; left pending", { refundId: args.refundId, why });
    return applyAnswer({ ...args, status: "pending", processorRefundId: null, why });
  }
  return applyAnswer({ ...args, ...fromProcessor(result), processorRefundId: result.id, why: `processor status ${result.status}` });
}

function fromProcessor(refund: Stripe.Refund): { status: "succeeded" | "failed" | "pending" } {
  if (refund.status === "succeeded") return { status: "succeeded" };
  if (refund.status === "failed" || refund.status === "canceled") return { status: "failed" };
  return { status: "pending" };
}

async function applyAnswer({
  refundId,
  paymentId,
  status,
  processorRefundId,
  why,
  actorId,
}: {
  refundId: string;
  paymentId: string;
  status: "succeeded" | "failed" | "pending";
  processorRefundId: string | null;
  why: string;
  actorId: string | null;
}): Promise<RefundOutcome["status"]> {
  return transaction(async (ctx) => {
    const row = await lockRefund(ctx, { refundId });
    if (!row) throw new AppError("not_found", "That refund was not found.");
    // The webhook may have settled it while we waited for the answer: its word stands.
    if (row.status === "succeeded" || row.status === "failed") return row.status;
    if (status === "pending") {
      if (row.status === "requested") await markRefundPending(ctx, { refundId, processorRefundId });
      else if (processorRefundId && !row.processorRefundId) await setRefundProcessorId(ctx, { refundId, processorRefundId });
      if (row.status === "requested") {
        await audit(ctx, {
          actorId,
          action: "refund.pending",
          entity: "refund",
          entityId: refundId,
          before: { status: row.status },
          after: { status: "pending", why, paymentId },
        });
      }
      return "pending";
    }
    await settleRefundRow(ctx, { refundId, status, processorRefundId });
    await notifyRefundSettled(ctx, refundId, status);
    if (status === "succeeded") await issueRefundNote(ctx, refundId, actorId);
    await audit(ctx, {
      actorId,
      action: `refund.${status}`,
      entity: "refund",
      entityId: refundId,
      before: { status: row.status },
      after: { status, processorRefundId, why, paymentId },
    });
    return status;
  });
}

/**
 * Settles an open refund from what the processor says about it: read back by its id when we know it, else
 * found among the payment's refunds by our reference, else asked again with the same idempotency key (the
 * first call never arrived, or the processor replays its answer). Safe to run any number of times.
 */
export async function reconcileRefund({ refundId, actorId }: { refundId: string; actorId: string | null }): Promise<RefundOutcome> {
  const row = await getRefundForOffice({ refundId });
  if (!row) throw new AppError("not_found", "That refund was not found.");
  const done = (status: RefundOutcome["status"]): RefundOutcome => ({ refundId, amountMinor: row.amountMinor, status });
  if (row.status === "succeeded" || row.status === "failed") return done(row.status);
  const payment = await getPaymentRowForOffice({ paymentId: row.paymentId });
  if (!payment?.paymentIntentId) throw new AppError("conflict", "This refund's payment has no processor reference.");

  let found: Stripe.Refund | undefined;
  try {
    if (row.processorRefundId) found = await stripe().refunds.retrieve(row.processorRefundId);
    else {
      const list = await stripe().refunds.list({ payment_intent: payment.paymentIntentId, limit: 100 });
      found = list.data.find((r) => r.metadata?.refundId === refundId);
    }
  } catch (e) {
    console.error("[bandedge] refund read-back failed", { refundId, e });
    throw new AppError("unavailable", "The payment processor did not answer. The refund stays pending; try again in a moment.");
  }
  if (found) {
    if (found.amount !== row.amountMinor) {
      console.error("[bandedge] refund read back with another amount", { refundId, asked: row.amountMinor, got: found.amount });
      return done(row.status);
    }
    const status = await applyAnswer({
      refundId,
      paymentId: row.paymentId,
      ...fromProcessor(found),
      processorRefundId: found.id,
      why: `read back: processor status ${found.status}`,
      actorId,
    });
    return done(status);
  }
  const status = await askProcessor({
    refundId,
    paymentId: row.paymentId,
    paymentIntentId: payment.paymentIntentId,
    jobId: payment.jobId,
    amountMinor: row.amountMinor,
    idempotencyKey: row.idempotencyKey,
    actorId,
  });
  return done(status);
}

/** The background sweep: every refund left open for a while is checked with the processor. */
export async function sweepOpenRefunds({ olderThanSeconds = 120 }: { olderThanSeconds?: number } = {}): Promise<number> {
  const open = await listOpenRefundsForOffice({ olderThanSeconds, limit: 20 });
  let settled = 0;
  for (const r of open) {
    try {
      const out = await reconcileRefund({ refundId: r.id, actorId: null });
      if (out.status === "succeeded" || out.status === "failed") settled++;
    } catch (e) {
      console.error("[bandedge] refund sweep: left for the next round", { refundId: r.id, e });
    }
  }
  return settled;
}

/**
 * Applies a processor refund event (the webhook) to our row: settles a requested or pending refund, marks
 * one the processor still calls pending. Returns the outcome recorded with the event.
 */
export async function applyRefundEvent(ctx: TxContext, paymentId: string, currency: string, refund: Stripe.Refund): Promise<string> {
  const refundId = refund.metadata?.refundId;
  if (!refundId || !UUID.test(refundId)) return "refund-without-reference";
  const row = await lockRefund(ctx, { refundId });
  if (!row || row.paymentId !== paymentId) return "refund-unknown";
  if (row.amountMinor !== refund.amount || refund.currency.toLowerCase() !== currency.toLowerCase()) {
    console.error("[bandedge] refund amount differs from the office's request", { refundId, asked: row.amountMinor, got: refund.amount });
    return "refund-mismatch";
  }
  if (row.status === "succeeded" || row.status === "failed") return `refund-${row.status}`;
  const { status } = fromProcessor(refund);
  if (status === "pending") {
    if (row.status === "requested") await markRefundPending(ctx, { refundId, processorRefundId: refund.id });
    else if (!row.processorRefundId) await setRefundProcessorId(ctx, { refundId, processorRefundId: refund.id });
    return "refund-pending";
  }
  await settleRefundRow(ctx, { refundId, status, processorRefundId: refund.id });
  await notifyRefundSettled(ctx, refundId, status);
  if (status === "succeeded") await issueRefundNote(ctx, refundId);
  await audit(ctx, {
    actorId: null,
    action: `refund.${status}`,
    entity: "refund",
    entityId: row.id,
    before: { status: row.status },
    after: { status, processorRefundId: refund.id },
  });
  return `refund-${status}`;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

// The shop hears how a refund ended; whoever asked for it is told on the spot by the office page instead.
async function notifyRefundSettled(ctx: TxContext, refundId: string, status: "succeeded" | "failed") {
  const [row] = await ctx.tx
    .select({
      refund: refunds,
      currency: payments.currency,
      jobId: jobs.id,
      number: jobs.number,
      maker: radioSets.maker,
      model: radioSets.model,
    })
    .from(refunds)
    .innerJoin(payments, eq(payments.id, refunds.paymentId))
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(eq(refunds.id, refundId))
    .limit(1);
  if (!row) return;
  const { exponent, code } = (await getShop()).policy.currency;
  const amount = money(row.refund.amountMinor, exponent, code);
  await notifyStaff(ctx, {
    kind: "refund_settled",
    jobId: row.jobId,
    technicianId: null,
    actorId: row.refund.createdBy,
    shopOnly: true,
    title: `${row.refund.kind === "reduction" ? "Price reduction" : "Refund"} of ${amount} ${status === "succeeded" ? "settled" : "failed"} on ${jobNumber(row.number)}: ${row.maker} ${row.model}`,
    body:
      status === "succeeded"
        ? `Reason given: ${row.refund.reason}`
        : `The processor refused it; the money was not returned. Reason given: ${row.refund.reason}`,
    dedupeKey: `refund:${refundId}`,
  });
}
