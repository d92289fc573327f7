import "server-only";
import { and, eq, isNotNull, isNull, ne } from "drizzle-orm";
import { db } from "@/db";
import type Stripe from "stripe";
import { countCheckouts, listLiveCheckouts } from "@/db/queries/payments";
import { estimateRevisions, jobs, paymentEvents, payments, radioSets, refunds, user } from "@/db/schema";
import type { JobState } from "@/lib/engine/jobs/states";
import { transaction, type TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { jobNumber } from "@/lib/engine/jobs/states";
import { queueEmail } from "@/lib/server/mail";
import { stripe } from "@/lib/server/payments";
import { loadJobAccount, settleIfNothingOwed } from "@/lib/server/services/account";
import { applyRefundEvent } from "@/lib/server/services/refunds";
import { notifyStaff } from "@/lib/server/services/notifications";
import { issueReceipt } from "@/lib/server/services/document-numbers";
import { transitionJob } from "@/lib/server/services/jobs";
import { moneyText } from "@/lib/validation/estimate";
import { formatDate } from "@/lib/engine/dates";
import { readShopTimeZone } from "@/lib/server/services/shop";

export type PaymentPurpose = "deposit" | "balance";
type PaymentRow = typeof payments.$inferSelect;
type PaymentStatus = PaymentRow["status"];

// Which job state a payment of each purpose is asked in, and where the job goes once the money is in.
const SETTLES: Record<PaymentPurpose, { from: JobState; to: JobState }> = {
  deposit: { from: "approved", to: "deposit_paid" },
  balance: { from: "balance_due", to: "paid_in_full" },
};

const UNAVAILABLE =
  "The payment service did not answer. Nothing was charged and nothing changed on your job; please try again in a minute.";

function exponentOf(revision: { pricing: Record<string, unknown> }): number {
  const e = revision.pricing.exponent;
  return typeof e === "number" && Number.isInteger(e) ? e : 2;
}

export type CheckoutResult = { kind: "redirect"; url: string; paymentId: string } | { kind: "confirming"; paymentId: string };

type CheckoutPlan =
  | { kind: "confirming"; paymentId: string }
  | { kind: "check"; paymentId: string; sessionId: string }
  | {
      kind: "create";
      paymentId: string;
      idempotencyKey: string;
      params: Stripe.Checkout.SessionCreateParams;
      amountMinor: number;
      currency: string;
      revisionId: string;
    };

/**
 * Opens (or reopens) a hosted checkout for the deposit or the balance. Three short steps, none of which holds
 * a transaction across the network: (1) under the job's row lock, work out the amount from the job's account
 * and reserve a payment row with our idempotency key (a double click finds the reservation and uses the same
 * key); (2) ask the processor, outside any transaction; (3) record the session on the row. A failing or slow
 * processor releases the reservation and answers a retryable 503: nothing is charged and nothing changes,
 * and because the key is derived from the reservations left, a retry asks with the same key and gets the
 * same session back if the processor did make one.
 */
export async function startCheckout(input: { jobId: string; customerId: string; purpose: PaymentPurpose }): Promise<CheckoutResult> {
  for (let round = 0; round < 3; round++) {
    const plan = await transaction((ctx) => planCheckout(ctx, input));
    if (plan.kind === "confirming") return plan;
    if (plan.kind === "check") {
      let session: Stripe.Checkout.Session;
      try {
        session = await stripe().checkout.sessions.retrieve(plan.sessionId);
      } catch (error) {
        console.error("[bandedge] checkout retrieve failed", error);
        throw new AppError("unavailable", UNAVAILABLE);
      }
      if (session.status === "open" && session.url) return { kind: "redirect", url: session.url, paymentId: plan.paymentId };
      if (session.status === "complete") return { kind: "confirming", paymentId: plan.paymentId };
      // Expired at the processor: the webhook may not have told us yet.
      await db
        .update(payments)
        .set({ status: "expired" })
        .where(and(eq(payments.id, plan.paymentId), eq(payments.status, "open")));
      continue;
    }
    let session: Stripe.Checkout.Session;
    try {
      session = await stripe().checkout.sessions.create(plan.params, { idempotencyKey: plan.idempotencyKey });
    } catch (error) {
      console.error("[bandedge] checkout create failed", error);
      await releaseReservation(plan.paymentId);
      throw new AppError("unavailable", UNAVAILABLE);
    }
    if (session.amount_total !== plan.amountMinor || session.currency !== plan.currency.toLowerCase() || !session.url) {
      console.error("[bandedge] checkout session does not match what we asked for", {
        sessionId: session.id,
        amount: session.amount_total,
      });
      await releaseReservation(plan.paymentId);
      throw new AppError("unavailable", UNAVAILABLE);
    }
    const url = session.url;
    return transaction(async (ctx) => {
      // Two clicks may both have asked with the same key: the row is keyed by it, so both record one session.
      const [row] = await ctx.tx
        .insert(payments)
        .values({
          jobId: input.jobId,
          revisionId: plan.revisionId,
          purpose: input.purpose,
          amountMinor: plan.amountMinor,
          currency: plan.currency,
          status: "open",
          checkoutSessionId: session.id,
          checkoutUrl: url,
          idempotencyKey: plan.idempotencyKey,
          createdBy: input.customerId,
        })
        .onConflictDoUpdate({ target: payments.idempotencyKey, set: { checkoutSessionId: session.id, checkoutUrl: url } })
        .returning({ id: payments.id, status: payments.status });
      await audit(ctx, {
        actorId: input.customerId,
        action: "payment.checkout",
        entity: "payment",
        entityId: row!.id,
        before: null,
        after: {
          purpose: input.purpose,
          amountMinor: plan.amountMinor,
          currency: plan.currency,
          revisionId: plan.revisionId,
          sessionId: session.id,
        },
      });
      return { kind: "redirect" as const, url, paymentId: row!.id };
    });
  }
  throw new AppError("unavailable", UNAVAILABLE);
}

// A reservation the processor never turned into a session is removed, so nothing half done remains.
async function releaseReservation(paymentId: string): Promise<void> {
  await db
    .delete(payments)
    .where(and(eq(payments.id, paymentId), isNull(payments.checkoutSessionId), eq(payments.status, "open")))
    .catch((error: unknown) => console.error("[bandedge] could not release a checkout reservation", paymentId, error));
}

async function planCheckout(ctx: TxContext, input: { jobId: string; customerId: string; purpose: PaymentPurpose }): Promise<CheckoutPlan> {
  const { tx } = ctx;
  const [row] = await tx
    .select({ job: jobs, set: radioSets, email: user.email })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(and(eq(jobs.id, input.jobId), eq(jobs.customerId, input.customerId)))
    .for("update", { of: jobs })
    .limit(1);
  if (!row) throw new AppError("not_found", "That job was not found.");
  const { job, set } = row;
  if (job.state !== SETTLES[input.purpose].from) {
    throw new AppError(
      "conflict",
      input.purpose === "deposit"
        ? "There is no deposit to pay on this job right now."
        : "There is no balance to pay on this job right now.",
    );
  }
  const { account, revision, paidDepositsMinor, processorMinimumMinor, exponent } = await loadJobAccount(tx, job.id);
  if (!revision) throw new AppError("conflict", "This job has no approved estimate yet.");

  // Deposit: the approved revision's deposit less deposits already paid (a revision sent before the set
  // came in asks only for the difference), never more than what is owed. Balance: what the account says is
  // owed (payments less refunds, less anything waived, against the approved total).
  const amountMinor =
    input.purpose === "deposit" ? Math.min(revision.depositMinor - paidDepositsMinor, account.owedMinor) : account.owedMinor;
  if (amountMinor <= 0) throw new AppError("conflict", "Nothing is left to pay on this job.");
  const currency = revision.currency;
  // The processor would refuse it: never ask. The shop settles such a remainder (see settleIfNothingOwed).
  if (amountMinor < processorMinimumMinor)
    throw new AppError(
      "conflict",
      `${moneyText(amountMinor, currency, exponent)} is below the smallest card payment (${moneyText(processorMinimumMinor, currency, exponent)}) and cannot be paid online; the shop settles it for you.`,
    );

  for (const live of await listLiveCheckouts(tx, { revisionId: revision.id, purpose: input.purpose })) {
    if (live.status === "paid" || live.status === "processing") return { kind: "confirming", paymentId: live.id };
    if (live.amountMinor !== amountMinor) continue;
    if (live.checkoutSessionId) return { kind: "check", paymentId: live.id, sessionId: live.checkoutSessionId };
    // Reserved by a click still talking to the processor: ask with the same key, get the same session.
    return createPlan(live.id, live.idempotencyKey);
  }

  const attempt = (await countCheckouts(tx, { revisionId: revision.id, purpose: input.purpose })) + 1;
  const idempotencyKey = `bandedge:${input.purpose}:${revision.id}:${attempt}`;
  const [reserved] = await tx
    .insert(payments)
    .values({
      jobId: job.id,
      revisionId: revision.id,
      purpose: input.purpose,
      amountMinor,
      currency,
      status: "open",
      idempotencyKey,
      createdBy: input.customerId,
    })
    .returning({ id: payments.id });
  return createPlan(reserved!.id, idempotencyKey);

  function createPlan(paymentId: string, key: string): CheckoutPlan {
    const base = env().APP_URL;
    const label = input.purpose === "deposit" ? "Deposit" : "Balance";
    return {
      kind: "create",
      paymentId,
      idempotencyKey: key,
      amountMinor,
      currency,
      revisionId: revision!.id,
      params: {
        mode: "payment",
        line_items: [
          {
            quantity: 1,
            price_data: {
              currency: currency.toLowerCase(),
              unit_amount: amountMinor,
              product_data: {
                name: `${label} for ${jobNumber(job.number)} — ${set.maker} ${set.model} (estimate revision ${revision!.revision})`,
              },
            },
          },
        ],
        client_reference_id: job.id,
        customer_email: row!.email,
        metadata: { jobId: job.id, revisionId: revision!.id, purpose: input.purpose },
        payment_intent_data: { metadata: { jobId: job.id, revisionId: revision!.id, purpose: input.purpose } },
        success_url: `${base}/portal/jobs/${job.id}/payment?session_id={CHECKOUT_SESSION_ID}`,
        cancel_url: `${base}/portal/jobs/${job.id}?payment=cancelled`,
      },
    };
  }
}

/**
 * Closes a job's checkouts that can no longer be right — every open session but `keep` — at the processor
 * (the SDK's expire call) and in our rows, so an owner cannot pay for a superseded revision or an old amount.
 * Called after the commit of the change that made them stale, never inside a transaction. A session the
 * processor will not expire (already paid or expired) is left to its webhook; if money still arrives for it,
 * it is recorded and shows as owed back.
 */
export async function expireStaleCheckouts(jobId: string, { keep }: { keep?: string } = {}): Promise<number> {
  const open = await db
    .select({ id: payments.id, sessionId: payments.checkoutSessionId })
    .from(payments)
    .where(and(eq(payments.jobId, jobId), eq(payments.status, "open"), isNotNull(payments.checkoutSessionId)));
  let expired = 0;
  for (const p of open) {
    if (p.id === keep || !p.sessionId) continue;
    try {
      const session = await stripe().checkout.sessions.expire(p.sessionId);
      if (session.status !== "expired") continue;
    } catch (error) {
      console.error("[bandedge] could not expire a stale checkout session", { paymentId: p.id, error: String(error) });
      continue;
    }
    const [row] = await db
      .update(payments)
      .set({ status: "expired" })
      .where(and(eq(payments.id, p.id), eq(payments.status, "open")))
      .returning({ id: payments.id });
    if (row) expired++;
  }
  return expired;
}

// ---- webhooks ----

export const HANDLED_EVENTS = new Set([
  "checkout.session.completed",
  "checkout.session.async_payment_succeeded",
  "checkout.session.async_payment_failed",
  "checkout.session.expired",
  "charge.refunded",
  "refund.created",
  "refund.updated",
]);

// A payment only moves forward: paid never goes back, whatever order the events arrive in.
const RANK: Record<PaymentStatus, number> = { open: 0, processing: 1, failed: 2, expired: 2, paid: 3, duplicate: 3, voided: 4 };

export type WebhookOutcome = { outcome: string; /** The job whose payment completed: its other checkouts are stale. */ paidJobId?: string };

/** Applies one verified processor event exactly once: its id is stored in the same transaction as its effect. */
export async function handleStripeEvent(event: Stripe.Event): Promise<WebhookOutcome> {
  if (!HANDLED_EVENTS.has(event.type)) return { outcome: "ignored" };
  return transaction(async (ctx) => {
    switch (event.type) {
      case "checkout.session.completed":
      case "checkout.session.async_payment_succeeded":
      case "checkout.session.async_payment_failed":
      case "checkout.session.expired":
        return onCheckoutEvent(ctx, event.id, event.type, event.data.object);
      case "charge.refunded":
        return onChargeRefunded(ctx, event.id, event.type, event.data.object);
      case "refund.created":
      case "refund.updated":
        return onRefund(ctx, event.id, event.type, event.data.object);
      default:
        return { outcome: "ignored" };
    }
  });
}

// Claims the event id; false when an earlier (or concurrent, now committed) delivery already did the work.
async function claimEvent(ctx: TxContext, eventId: string, type: string, paymentId: string | null, outcome = "received"): Promise<boolean> {
  const [row] = await ctx.tx
    .insert(paymentEvents)
    .values({ id: eventId, type, paymentId, outcome })
    .onConflictDoNothing({ target: paymentEvents.id })
    .returning({ id: paymentEvents.id });
  return Boolean(row);
}

async function finish(ctx: TxContext, eventId: string, outcome: string): Promise<WebhookOutcome> {
  await ctx.tx.update(paymentEvents).set({ outcome }).where(eq(paymentEvents.id, eventId));
  return { outcome };
}

function idOf(v: string | { id: string } | null | undefined): string | null {
  if (!v) return null;
  return typeof v === "string" ? v : v.id;
}

async function onCheckoutEvent(ctx: TxContext, eventId: string, type: string, session: Stripe.Checkout.Session): Promise<WebhookOutcome> {
  const { tx } = ctx;
  const [payment] = await tx.select().from(payments).where(eq(payments.checkoutSessionId, session.id)).for("update").limit(1);
  if (!payment) {
    // Nothing to apply: the event is stored with its outcome in the one statement that claims it.
    if (!(await claimEvent(ctx, eventId, type, null, "unknown-session"))) return { outcome: "duplicate" };
    console.error("[bandedge] webhook for an unknown checkout session", { eventId, sessionId: session.id });
    return { outcome: "unknown-session" };
  }
  if (!(await claimEvent(ctx, eventId, type, payment.id))) return { outcome: "duplicate" };

  const [revision] = await tx.select().from(estimateRevisions).where(eq(estimateRevisions.id, payment.revisionId)).limit(1);
  const problems: string[] = [];
  if (session.amount_total !== payment.amountMinor) problems.push(`amount ${session.amount_total} ≠ ${payment.amountMinor}`);
  if ((session.currency ?? "").toLowerCase() !== payment.currency.toLowerCase())
    problems.push(`currency ${session.currency} ≠ ${payment.currency}`);
  if (session.metadata?.jobId !== payment.jobId) problems.push("job id");
  if (session.metadata?.revisionId !== payment.revisionId) problems.push("revision id");
  if (session.metadata?.purpose !== payment.purpose) problems.push("purpose");
  if (!revision || revision.jobId !== payment.jobId) problems.push("revision missing");
  else if (payment.amountMinor > revision.totalMinor || revision.currency !== payment.currency)
    problems.push("payment does not fit the revision");
  if (problems.length) {
    console.error("[bandedge] payment event does not match our records; not marked paid", { eventId, paymentId: payment.id, problems });
    await audit(ctx, {
      actorId: null,
      action: "payment.mismatch",
      entity: "payment",
      entityId: payment.id,
      before: { status: payment.status },
      after: { eventId, type, problems },
    });
    return finish(ctx, eventId, `mismatch: ${problems.join("; ")}`);
  }

  const paid = session.payment_status === "paid";
  if (type === "checkout.session.completed" || type === "checkout.session.async_payment_succeeded") {
    if (paid)
      return { ...(await finish(ctx, eventId, await markPaid(ctx, payment, idOf(session.payment_intent)))), paidJobId: payment.jobId };
    if (type === "checkout.session.completed") return finish(ctx, eventId, await advance(ctx, payment, "processing"));
    return finish(ctx, eventId, "not-paid");
  }
  if (type === "checkout.session.async_payment_failed") return finish(ctx, eventId, await advance(ctx, payment, "failed"));
  return finish(ctx, eventId, await advance(ctx, payment, "expired"));
}

async function advance(ctx: TxContext, payment: PaymentRow, to: PaymentStatus): Promise<string> {
  if (RANK[to] <= RANK[payment.status]) return `kept-${payment.status}`;
  await ctx.tx.update(payments).set({ status: to }).where(eq(payments.id, payment.id));
  await audit(ctx, {
    actorId: null,
    action: `payment.${to}`,
    entity: "payment",
    entityId: payment.id,
    before: { status: payment.status },
    after: { status: to },
  });
  return to;
}

async function markPaid(ctx: TxContext, payment: PaymentRow, paymentIntentId: string | null): Promise<string> {
  const { tx } = ctx;
  if (payment.status === "paid") return "already-paid";
  if (payment.status === "duplicate") return "duplicate-charge";
  const [other] = await tx
    .select({ id: payments.id })
    .from(payments)
    .where(
      and(
        eq(payments.revisionId, payment.revisionId),
        eq(payments.purpose, payment.purpose),
        eq(payments.status, "paid"),
        ne(payments.id, payment.id),
      ),
    )
    .limit(1);
  if (other) {
    // A second checkout for the same thing was paid: keep the money visible to the office for a refund.
    console.error("[bandedge] a second payment arrived for an already paid revision", { paymentId: payment.id, paidId: other.id });
    await tx.update(payments).set({ status: "duplicate", paidAt: new Date(), paymentIntentId }).where(eq(payments.id, payment.id));
    await audit(ctx, {
      actorId: null,
      action: "payment.duplicate",
      entity: "payment",
      entityId: payment.id,
      before: { status: payment.status },
      after: { paidId: other.id, paymentIntentId },
    });
    await issueReceipt(ctx, payment.id);
    return "duplicate-charge";
  }
  const paidAt = new Date();
  await tx.update(payments).set({ status: "paid", paidAt, paymentIntentId }).where(eq(payments.id, payment.id));
  await audit(ctx, {
    actorId: null,
    action: "payment.paid",
    entity: "payment",
    entityId: payment.id,
    before: { status: payment.status },
    after: { status: "paid", amountMinor: payment.amountMinor, currency: payment.currency, paymentIntentId },
  });
  // Numbered in this transaction, before the job moves on (which may issue the invoice that lists it).
  await issueReceipt(ctx, payment.id);

  const [row] = await tx
    .select({ job: jobs, set: radioSets, name: user.name, email: user.email, revision: estimateRevisions })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .innerJoin(estimateRevisions, eq(estimateRevisions.id, payment.revisionId))
    .where(eq(jobs.id, payment.jobId))
    .for("update", { of: jobs })
    .limit(1);
  if (!row) return "paid";
  let outcome = "paid";
  const { account, revision: current, paidDepositsMinor } = await loadJobAccount(tx, row.job.id);
  const stale = !current || current.id !== payment.revisionId || row.job.state !== SETTLES[payment.purpose].from;
  if (stale) {
    // Money for a checkout that was superseded (a newer revision, an old amount) or for a job that moved on:
    // recorded and counted in the account, never lost, and flagged for the office to refund or credit.
    outcome = "paid-superseded";
    await tx.update(payments).set({ arrivedStale: true }).where(eq(payments.id, payment.id));
    console.error("[bandedge] payment received for a superseded checkout", { paymentId: payment.id, state: row.job.state });
    await audit(ctx, {
      actorId: null,
      action: "payment.superseded",
      entity: "payment",
      entityId: payment.id,
      before: { jobState: row.job.state },
      after: { revisionId: payment.revisionId, currentRevisionId: current?.id ?? null, owedBackMinor: account.owedBackMinor },
    });
  }
  const amountText = moneyText(payment.amountMinor, payment.currency, exponentOf(row.revision));
  if (row.job.state === "approved" && current && (paidDepositsMinor >= current.depositMinor || account.owedMinor === 0)) {
    await transitionJob(ctx, {
      jobId: row.job.id,
      to: "deposit_paid",
      actor: "system",
      actorId: null,
      note: `${payment.purpose === "deposit" ? "Deposit" : "Payment"} of ${amountText} received`,
    });
  } else if (row.job.state === "balance_due") {
    await settleIfNothingOwed(ctx, row.job.id);
  }
  await queueEmail(ctx, {
    to: row.email,
    template: payment.purpose === "deposit" ? "deposit-receipt" : "balance-receipt",
    props: {
      name: row.name,
      jobNumber: jobNumber(row.job.number),
      setName: `${row.set.maker} ${row.set.model}`,
      url: `${env().APP_URL}/portal/jobs/${row.job.id}`,
      amountText: moneyText(payment.amountMinor, payment.currency, exponentOf(row.revision)),
      paidAt: formatDate(paidAt, { timeZone: await readShopTimeZone(tx) }),
      reference: paymentIntentId ?? payment.id,
    },
    dedupeKey: `receipt:${payment.id}`,
  });
  // Keyed by the payment: the event id already stops a redelivery, and a second event for it tells nobody again.
  await notifyStaff(ctx, {
    kind: "payment_received",
    jobId: row.job.id,
    technicianId: row.job.technicianId,
    actorId: row.job.customerId,
    title: `${payment.purpose === "deposit" ? "Deposit" : "Balance"} of ${amountText} received on ${jobNumber(row.job.number)}: ${row.set.maker} ${row.set.model}`,
    body:
      outcome === "paid-superseded"
        ? `Paid by ${row.name} for a checkout that was superseded; see the office's payments to refund or credit it.`
        : `Paid by ${row.name}.`,
    dedupeKey: `payment:${payment.id}`,
  });
  return outcome;
}

async function onChargeRefunded(ctx: TxContext, eventId: string, type: string, charge: Stripe.Charge): Promise<WebhookOutcome> {
  const { tx } = ctx;
  const intentId = idOf(charge.payment_intent);
  const [payment] = intentId ? await tx.select().from(payments).where(eq(payments.paymentIntentId, intentId)).for("update").limit(1) : [];
  for (const refund of charge.refunds?.data ?? []) await requireRefundRow(ctx, refund);
  if (!(await claimEvent(ctx, eventId, type, payment?.id ?? null))) return { outcome: "duplicate" };
  if (!payment) {
    console.error("[bandedge] refund event for an unknown payment", { eventId, intentId });
    return finish(ctx, eventId, "unknown-payment");
  }
  if (charge.currency.toLowerCase() !== payment.currency.toLowerCase() || charge.amount_refunded > payment.amountMinor) {
    console.error("[bandedge] refund event does not match the payment", { eventId, paymentId: payment.id });
    await audit(ctx, {
      actorId: null,
      action: "refund.mismatch",
      entity: "payment",
      entityId: payment.id,
      before: null,
      after: { eventId },
    });
    return finish(ctx, eventId, "mismatch");
  }
  for (const refund of charge.refunds?.data ?? []) await settleRefund(ctx, payment, refund);
  if (charge.amount_refunded > payment.refundedMinor) {
    await tx.update(payments).set({ refundedMinor: charge.amount_refunded }).where(eq(payments.id, payment.id));
    await audit(ctx, {
      actorId: null,
      action: "payment.refunded",
      entity: "payment",
      entityId: payment.id,
      before: { refundedMinor: payment.refundedMinor },
      after: { refundedMinor: charge.amount_refunded },
    });
  }
  return finish(ctx, eventId, "refund-recorded");
}

async function onRefund(ctx: TxContext, eventId: string, type: string, refund: Stripe.Refund): Promise<WebhookOutcome> {
  const { tx } = ctx;
  const intentId = idOf(refund.payment_intent);
  const [payment] = intentId ? await tx.select().from(payments).where(eq(payments.paymentIntentId, intentId)).for("update").limit(1) : [];
  await requireRefundRow(ctx, refund);
  if (!(await claimEvent(ctx, eventId, type, payment?.id ?? null))) return { outcome: "duplicate" };
  if (!payment) return finish(ctx, eventId, "unknown-payment");
  return finish(ctx, eventId, await settleRefund(ctx, payment, refund));
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

// The office writes the refund row before asking the processor; if its transaction has not committed yet,
// answer "try again" so the processor redelivers instead of losing the update.
async function requireRefundRow(ctx: TxContext, refund: Stripe.Refund): Promise<void> {
  const refundId = refund.metadata?.refundId;
  if (!refundId || !UUID.test(refundId)) return;
  const [row] = await ctx.tx.select({ id: refunds.id }).from(refunds).where(eq(refunds.id, refundId)).limit(1);
  if (!row) throw new AppError("unavailable", "Refund not recorded yet; deliver again later.");
}

// Refund rows are settled by the refunds service, which also reads refunds back when a webhook never comes.
function settleRefund(ctx: TxContext, payment: PaymentRow, refund: Stripe.Refund): Promise<string> {
  return applyRefundEvent(ctx, payment.id, payment.currency, refund);
}
