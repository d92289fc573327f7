import { and, eq, sql } from "drizzle-orm";
import { auditEvents, jobs, payments, refunds } from "@/db/schema";
import type { TxContext } from "@/db/transaction";

const OWNER = "demo-owner-odile";

// One settled partial refund on the returned demo job: a spare part quoted and not needed. It stands in for
// the processor's confirmation, as the demo payments do; the app itself settles refunds only from the processor.
export async function seedDemoRefund(ctx: TxContext): Promise<number> {
  const [payment] = await ctx.tx
    .select({ id: payments.id, amountMinor: payments.amountMinor, paidAt: payments.paidAt })
    .from(payments)
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .where(and(eq(jobs.idempotencyKey, "demo-returned"), eq(payments.purpose, "balance"), eq(payments.status, "paid")))
    .limit(1);
  if (!payment) return 0;
  const amountMinor = Math.min(1250, payment.amountMinor);
  const [refund] = await ctx.tx
    .insert(refunds)
    .values({
      paymentId: payment.id,
      amountMinor,
      reason: "The spare dial lamp on the estimate was not needed: the original one lit once its socket was cleaned.",
      status: "succeeded",
      processorRefundId: "re_demo_returned_dial_lamp",
      idempotencyKey: "demo:refund:returned-dial-lamp",
      createdBy: OWNER,
      createdAt: sql`coalesce(${payment.paidAt}, now()) + interval '1 hour'`,
      settledAt: sql`coalesce(${payment.paidAt}, now()) + interval '2 hours'`,
    })
    .onConflictDoNothing({ target: refunds.idempotencyKey })
    .returning({ id: refunds.id });
  if (!refund) return 0;
  await ctx.tx
    .update(payments)
    .set({ refundedMinor: sql`${payments.refundedMinor} + ${amountMinor}` })
    .where(eq(payments.id, payment.id));
  await ctx.tx.insert(auditEvents).values([
    {
      actorId: OWNER,
      action: "refund.request",
      entity: "payment",
      entityId: payment.id,
      before: { refundedMinor: 0, inFlightMinor: 0 },
      after: { refundId: refund.id, amountMinor, status: "requested" },
    },
    {
      actorId: null,
      action: "refund.succeeded",
      entity: "refund",
      entityId: refund.id,
      before: { status: "requested" },
      after: { status: "succeeded", processorRefundId: "re_demo_returned_dial_lamp" },
    },
  ]);
  return 1;
}
