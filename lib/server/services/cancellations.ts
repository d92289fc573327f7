import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { jobs, messages, payments, refunds } from "@/db/schema";
import { transaction } from "@/db/transaction";
import { accountOf, type Account } from "@/lib/engine/pricing/account";
import { formatMinor } from "@/lib/engine/pricing/money";
import { SHOP_CANCELLABLE, STATE_LABEL, type JobState } from "@/lib/engine/jobs/states";
import { AppError } from "@/lib/server/errors";
import { transitionJob } from "@/lib/server/services/jobs";
import { returnStockForJob } from "@/lib/server/services/parts";
import { requestRefund, type RefundOutcome } from "@/lib/server/services/refunds";
import { getShop } from "@/lib/server/services/shop";

/** A set owner takes back a quote request nobody has started on. */
export async function withdrawQuote({ jobId, customerId, reason }: { jobId: string; customerId: string; reason: string | null }) {
  return transaction(async (ctx) => {
    const [job] = await ctx.tx
      .select()
      .from(jobs)
      .where(and(eq(jobs.id, jobId), eq(jobs.customerId, customerId)))
      .for("update")
      .limit(1);
    if (!job) throw new AppError("not_found", "That job was not found.");
    if (job.state !== "requested") {
      throw new AppError(
        "invalid_transition",
        `A request can be withdrawn only before the shop starts on it; this one is "${STATE_LABEL[job.state].owner}". Write to the shop below instead.`,
      );
    }
    if (reason)
      await ctx.tx.insert(messages).values({ jobId, authorId: customerId, body: `I withdraw this request: ${reason}`, internal: false });
    const { after } = await transitionJob(ctx, {
      jobId,
      to: "cancelled",
      actor: "customer",
      actorId: customerId,
      note: reason ?? "Withdrawn by the owner",
    });
    return { state: after.state };
  });
}

export type CancelResult = {
  state: JobState;
  /** The job's account after cancelling: nothing is owed for work that was never done. */
  account: Account;
  refunds: { paymentId: string; amountMinor: number; outcome: RefundOutcome["status"] | "not-started"; message?: string }[];
  /** What is owed back and was not (yet) handed to the processor. */
  owedBackMinor: number;
};

/**
 * The shop calls off a job before the bench. No work was done, so the approved total no longer applies: the
 * account is taken with a total of zero and everything the shop holds is owed back. With `refund`, each paid
 * payment is refunded (through the normal refund path, after the job's change has committed); what could
 * not be started stays shown as owed back.
 */
export async function cancelJobByShop({
  jobId,
  actorId,
  reason,
  refund,
}: {
  jobId: string;
  actorId: string;
  reason: string;
  refund: boolean;
}): Promise<CancelResult> {
  const { state, paid } = await transaction(async (ctx) => {
    const [job] = await ctx.tx.select().from(jobs).where(eq(jobs.id, jobId)).for("update").limit(1);
    if (!job) throw new AppError("not_found", "That job was not found.");
    if (!SHOP_CANCELLABLE.includes(job.state)) {
      throw new AppError(
        "invalid_transition",
        `Only a job that is not on the bench yet can be cancelled; this one is "${STATE_LABEL[job.state].staff}".`,
      );
    }
    await ctx.tx.insert(messages).values({ jobId, authorId: actorId, body: `The shop has cancelled this job: ${reason}`, internal: false });
    const { after } = await transitionJob(ctx, { jobId, to: "cancelled", actor: "staff", actorId, note: reason });
    await returnStockForJob(ctx, { jobId, actorId });
    const rows = await ctx.tx
      .select({ id: payments.id, amountMinor: payments.amountMinor, status: payments.status, refundedMinor: payments.refundedMinor })
      .from(payments)
      .where(and(eq(payments.jobId, jobId), eq(payments.status, "paid")));
    return { state: after.state, paid: rows };
  });

  const result: CancelResult["refunds"] = [];
  if (refund) {
    const { exponent } = (await getShop()).policy.currency;
    for (const p of paid) {
      const open = await openRefundsOf(p.id);
      const left = p.amountMinor - p.refundedMinor - open;
      if (left <= 0) continue;
      try {
        const r = await requestRefund({
          paymentId: p.id,
          input: { amount: formatMinor(left, exponent), reason: `Job cancelled by the shop: ${reason}`.slice(0, 500) },
          actorId,
        });
        result.push({ paymentId: p.id, amountMinor: left, outcome: r.status });
      } catch (e) {
        result.push({
          paymentId: p.id,
          amountMinor: left,
          outcome: "not-started",
          message: e instanceof AppError ? e.message : "The refund could not be started.",
        });
      }
    }
  }
  const account = await accountForCancelledJob(jobId);
  return { state, account, refunds: result, owedBackMinor: account.owedBackMinor };
}

async function openRefundsOf(paymentId: string): Promise<number> {
  return transaction(async (ctx) => {
    const rows = await ctx.tx
      .select({ amountMinor: refunds.amountMinor })
      .from(refunds)
      .where(and(eq(refunds.paymentId, paymentId), inArray(refunds.status, ["requested", "pending"])));
    return rows.reduce((n, r) => n + r.amountMinor, 0);
  });
}

/** The account of a cancelled job: its payments and refunds against a total of zero. */
export async function accountForCancelledJob(jobId: string): Promise<Account> {
  return transaction(async (ctx) => {
    const ps = await ctx.tx
      .select({ id: payments.id, amountMinor: payments.amountMinor, status: payments.status })
      .from(payments)
      .where(eq(payments.jobId, jobId));
    const rs = ps.length
      ? await ctx.tx
          .select({ amountMinor: refunds.amountMinor, status: refunds.status, kind: refunds.kind })
          .from(refunds)
          .where(
            inArray(
              refunds.paymentId,
              ps.map((p) => p.id),
            ),
          )
      : [];
    return accountOf({ totalMinor: 0, payments: ps, refunds: rs });
  });
}
