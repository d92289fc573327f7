import "server-only";
import { and, desc, eq } from "drizzle-orm";
import type { Database } from "@/db";
import { listOwedBackCandidates } from "@/db/queries/owed-back";
import { estimateRevisions, jobs, payments, refunds, user } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { accountOf, remainderBelowMinimum, WAIVED_WORDING, type Account } from "@/lib/engine/pricing/account";
import { recordedProcessorMinimum } from "@/lib/engine/pricing/deposit";
import { audit } from "@/lib/server/audit";
import { issueInvoice } from "@/lib/server/services/document-numbers";
import { transitionJob } from "@/lib/server/services/jobs";
import { moneyText } from "@/lib/validation/estimate";

export type JobAccount = {
  account: Account;
  /** The revision the total comes from (null before any approval). */
  revision: typeof estimateRevisions.$inferSelect | null;
  currency: string;
  exponent: number;
  /** Paid deposits, for the deposit still due on a revision approved before the set came in. */
  paidDepositsMinor: number;
  /** The processor's smallest charge in the account's currency, as recorded with the revision. */
  processorMinimumMinor: number;
};

function exponentOf(pricing: Record<string, unknown> | undefined): number {
  const e = pricing?.exponent;
  return typeof e === "number" && Number.isInteger(e) ? e : 2;
}

/**
 * The one account of a job, read from the rows: the newest approved revision's total (or, when the owner had
 * the set returned as is, the total the work stopped at), every payment and every refund.
 */
export async function loadJobAccount(tx: Database, jobId: string): Promise<JobAccount> {
  const [job] = await tx
    .select({ settledTotalMinor: jobs.settledTotalMinor, waivedMinor: jobs.waivedMinor })
    .from(jobs)
    .where(eq(jobs.id, jobId))
    .limit(1);
  const [revision] = await tx
    .select()
    .from(estimateRevisions)
    .where(and(eq(estimateRevisions.jobId, jobId), eq(estimateRevisions.status, "approved")))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  const paymentRows = await tx
    .select({ id: payments.id, amountMinor: payments.amountMinor, status: payments.status, purpose: payments.purpose })
    .from(payments)
    .where(eq(payments.jobId, jobId));
  const refundRows = await tx
    .select({ amountMinor: refunds.amountMinor, status: refunds.status, kind: refunds.kind })
    .from(refunds)
    .innerJoin(payments, eq(payments.id, refunds.paymentId))
    .where(eq(payments.jobId, jobId));
  const totalMinor = job?.settledTotalMinor ?? revision?.totalMinor ?? 0;
  const account = accountOf({ totalMinor, payments: paymentRows, refunds: refundRows, waivedMinor: job?.waivedMinor ?? 0 });
  const [anyRevision] = revision
    ? [revision]
    : await tx
        .select()
        .from(estimateRevisions)
        .where(eq(estimateRevisions.jobId, jobId))
        .orderBy(desc(estimateRevisions.revision))
        .limit(1);
  const currency = anyRevision?.currency ?? "USD";
  return {
    account,
    revision: revision ?? null,
    currency,
    processorMinimumMinor: recordedProcessorMinimum(anyRevision?.pricing),
    exponent: exponentOf(anyRevision?.pricing),
    paidDepositsMinor: paymentRows.filter((p) => p.status === "paid" && p.purpose === "deposit").reduce((s, p) => s + p.amountMinor, 0),
  };
}

/**
 * A job waiting for its balance with nothing left to pay (warranty work, a cheaper revision, payments that
 * already cover the total) moves on to "paid in full" by itself: a system move, written to the history and
 * the audit log like any other. Money owed back is named in the note so the office sees it.
 *
 * A balance that is a positive amount below the processor's smallest charge (a scope change at the bench
 * after the deposit, a late payment) cannot be paid online: the shop waives it here, on the job with who
 * (`waivedBy`: the staff member whose act made it due, or nobody for a system move) and when, audited, and
 * the job moves on as paid. Nothing is ever asked beyond what is owed.
 */
export async function settleIfNothingOwed(
  ctx: TxContext,
  jobId: string,
  { actorId = null }: { actorId?: string | null } = {},
): Promise<{ account: Account; movedOn: boolean; waivedMinor: number }> {
  const [job] = await ctx.tx.select({ state: jobs.state }).from(jobs).where(eq(jobs.id, jobId)).for("update").limit(1);
  const loaded = await loadJobAccount(ctx.tx, jobId);
  const { currency, exponent, processorMinimumMinor } = loaded;
  let account = loaded.account;
  if (job?.state !== "balance_due") return { account, movedOn: false, waivedMinor: 0 };
  const waive = remainderBelowMinimum(account, processorMinimumMinor);
  if (waive > 0) {
    const waivedAt = new Date();
    const waivedMinor = account.waivedMinor + waive;
    await ctx.tx.update(jobs).set({ waivedMinor, waivedBy: actorId, waivedAt }).where(eq(jobs.id, jobId));
    await audit(ctx, {
      actorId,
      action: "account.waive_below_minimum",
      entity: "job",
      entityId: jobId,
      before: { owedMinor: account.owedMinor, waivedMinor: account.waivedMinor },
      after: { waivedMinor, processorMinimumMinor, currency, waivedAt: waivedAt.toISOString() },
    });
    account = (await loadJobAccount(ctx.tx, jobId)).account;
  }
  if (account.owedMinor > 0) return { account, movedOn: false, waivedMinor: 0 };
  const notes: string[] = [];
  if (waive > 0) {
    const [by] = actorId ? await ctx.tx.select({ name: user.name }).from(user).where(eq(user.id, actorId)).limit(1) : [];
    notes.push(
      `${moneyText(waive, currency, exponent)} ${WAIVED_WORDING} (${moneyText(processorMinimumMinor, currency, exponent)})${by ? ` by ${by.name}` : ""}`,
    );
  }
  if (account.owedBackMinor > 0) notes.push(`${moneyText(account.owedBackMinor, currency, exponent)} is owed back to the owner`);
  const note = notes.length ? `Nothing left to pay; ${notes.join("; ")}` : "Nothing left to pay";
  await transitionJob(ctx, { jobId, to: "paid_in_full", actor: "system", actorId: null, note });
  // The final account is known and nothing is left to pay: the invoice is issued with the move.
  await issueInvoice(ctx, jobId);
  return { account, movedOn: true, waivedMinor: waive };
}

export type OwedBackRow = {
  jobId: string;
  jobNumber: number;
  state: string;
  customerName: string;
  currency: string;
  owedBackMinor: number;
  /** Money arrived for a checkout that had been superseded. */
  stalePayment: boolean;
};

/** For the office: jobs where the shop holds more than the total, or money arrived for a superseded checkout. */
export async function listOwedBack(): Promise<OwedBackRow[]> {
  const rows = await listOwedBackCandidates();
  return rows
    .map((r) => ({
      r,
      account: accountOf({ totalMinor: r.totalMinor, payments: r.payments, refunds: r.refunds, waivedMinor: r.waivedMinor }),
    }))
    .filter(({ r, account }) => account.owedBackMinor > 0 || r.anyStale)
    .map(({ r, account }) => ({
      jobId: r.jobId,
      jobNumber: r.jobNumber,
      state: r.state,
      customerName: r.customerName,
      currency: r.currency,
      owedBackMinor: account.owedBackMinor,
      stalePayment: r.anyStale,
    }));
}
