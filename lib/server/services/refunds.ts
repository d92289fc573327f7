import "server-only";
import { randomUUID } from "node:crypto";
import Stripe from "stripe";
import { insertRefund, lockPaymentForRefund, markRefundFailed, setRefundProcessorId } from "@/db/queries/office";
import { transaction } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { isEngineError } from "@/lib/engine/engine-error";
import { AppError } from "@/lib/server/errors";
import { stripe } from "@/lib/server/payments";
import { formatMinor, toMinor } from "@/lib/engine/pricing/money";
import { queueRefundNotice } from "@/lib/server/services/notices";
import { getShop } from "@/lib/server/services/shop";
import type { RefundFormValues } from "@/lib/validation/office";

export type RefundRequested = { refundId: string; amountMinor: number; status: "requested" };

function money(amountMinor: number, exponent: number, code: string) {
  return `${code} ${formatMinor(amountMinor, exponent)}`;
}

/**
 * Asks the processor to refund part or all of a paid payment.
 *
 * The payment row is locked while the amount is checked and the refund row (status "requested", our own
 * idempotency key) is written, so two refunds at once can never add up to more than was paid: a requested
 * refund counts against what is left until the processor's webhook settles it. The processor call happens
 * after the commit; the refund is confirmed only by the `charge.refunded` webhook.
 */
export async function requestRefund({
  paymentId,
  input,
  actorId,
}: {
  paymentId: string;
  input: RefundFormValues;
  actorId: string;
}): Promise<RefundRequested> {
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
    const locked = await lockPaymentForRefund(ctx, { paymentId });
    if (!locked) throw new AppError("not_found", "That payment was not found.");
    const { payment: p, inFlightMinor } = locked;
    if (p.status !== "paid" || !p.paymentIntentId) throw new AppError("conflict", "Only a payment that has been received can be refunded.");
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
    await insertRefund(ctx, { id: refundId, paymentId, amountMinor, reason: input.reason, idempotencyKey, createdBy: actorId });
    await audit(ctx, {
      actorId,
      action: "refund.request",
      entity: "payment",
      entityId: paymentId,
      before: { refundedMinor: p.refundedMinor, inFlightMinor },
      after: { refundId, amountMinor, reason: input.reason, status: "requested" },
    });
    await queueRefundNotice(ctx, { paymentId, refundId, amountMinor });
    return p;
  });

  try {
    const result = await stripe().refunds.create(
      { payment_intent: payment.paymentIntentId!, amount: amountMinor, metadata: { refundId, paymentId, jobId: payment.jobId } },
      { idempotencyKey },
    );
    if (result.status === "failed" || result.status === "canceled") {
      await failRefund({ refundId, paymentId, actorId, why: `processor status ${result.status}` });
      throw new AppError("unavailable", "The payment processor declined this refund. Nothing was refunded; you can try again.");
    }
    await setRefundProcessorId({ refundId, processorRefundId: result.id });
  } catch (e) {
    if (e instanceof AppError) throw e;
    const why = e instanceof Stripe.errors.StripeError ? `${e.type}${e.code ? ` ${e.code}` : ""}` : "no answer";
    await failRefund({ refundId, paymentId, actorId, why });
    if (e instanceof Stripe.errors.StripeInvalidRequestError) {
      throw new AppError("conflict", "The payment processor refused this refund. Nothing was refunded; check the amount and try again.");
    }
    throw new AppError("unavailable", "The payment processor did not answer in time. Nothing was refunded; please try again in a moment.");
  }
  return { refundId, amountMinor, status: "requested" };
}

async function failRefund({ refundId, paymentId, actorId, why }: { refundId: string; paymentId: string; actorId: string; why: string }) {
  await transaction(async (ctx) => {
    const row = await markRefundFailed(ctx, { refundId });
    if (!row) return;
    await audit(ctx, {
      actorId,
      action: "refund.failed",
      entity: "payment",
      entityId: paymentId,
      before: { refundId, status: "requested" },
      after: { refundId, status: "failed", why },
    });
  });
}
