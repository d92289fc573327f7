import "server-only";
import { and, desc, eq } from "drizzle-orm";
import type { Database } from "@/db";
import { listOwedBackCandidates } from "@/db/queries/owed-back";
import { estimateRevisions, jobs, payments, refunds } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { accountOf, type Account } from "@/lib/engine/pricing/account";
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
  const [job] = await tx.select({ settledTotalMinor: jobs.settledTotalMinor }).from(jobs).where(eq(jobs.id, jobId)).limit(1);
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
    .select({ amountMinor: refunds.amountMinor, status: refunds.status })
    .from(refunds)
    .innerJoin(payments, eq(payments.id, refunds.paymentId))
    .where(eq(payments.jobId, jobId));
  const totalMinor = job?.settledTotalMinor ?? revision?.totalMinor ?? 0;
  const account = accountOf({ totalMinor, payments: paymentRows, refunds: refundRows });
  const [anyRevision] = revision
    ? [revision]
    : await tx
        .select()
        .from(estimateRevisions)
        .where(eq(estimateRevisions.jobId, jobId))
        .orderBy(desc(estimateRevisions.revision))
        .limit(1);
  return {
    account,
    revision: revision ?? null,
    currency: anyRevision?.currency ?? "USD",
    exponent: exponentOf(anyRevision?.pricing),
    paidDepositsMinor: paymentRows.filter((p) => p.status === "paid" && p.purpose === "deposit").reduce((s, p) => s + p.amountMinor, 0),
  };
}

/**
 * A job waiting for its balance with nothing left to pay (warranty work, a cheaper revision, payments that
 * already cover the total) moves on to "paid in full" by itself: a system move, written to the history and
 * the audit log like any other. Money owed back is named in the note so the office sees it.
 */
export async function settleIfNothingOwed(ctx: TxContext, jobId: string): Promise<{ account: Account; movedOn: boolean }> {
  const [job] = await ctx.tx.select({ state: jobs.state }).from(jobs).where(eq(jobs.id, jobId)).for("update").limit(1);
  const { account, currency, exponent } = await loadJobAccount(ctx.tx, jobId);
  if (job?.state !== "balance_due" || account.owedMinor > 0) return { account, movedOn: false };
  const note =
    account.owedBackMinor > 0
      ? `Nothing left to pay; ${moneyText(account.owedBackMinor, currency, exponent)} is owed back to the owner`
      : "Nothing left to pay";
  await transitionJob(ctx, { jobId, to: "paid_in_full", actor: "system", actorId: null, note });
  return { account, movedOn: true };
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
    .map((r) => ({ r, account: accountOf({ totalMinor: r.totalMinor, payments: r.payments, refunds: r.refunds }) }))
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
