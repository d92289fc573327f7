import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { estimateRevisions, jobs, payments } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { AppError } from "@/lib/server/errors";
import { transitionJob } from "@/lib/server/services/jobs";

type DecisionInput = { jobId: string; customerId: string; revisionId: string };

// Locks the owner's job and returns the revision waiting for a decision; anything else is not-found or 409.
async function pendingRevision(ctx: TxContext, input: DecisionInput) {
  const [job] = await ctx.tx
    .select()
    .from(jobs)
    .where(and(eq(jobs.id, input.jobId), eq(jobs.customerId, input.customerId)))
    .for("update")
    .limit(1);
  if (!job) throw new AppError("not_found", "That job was not found.");
  const [latest] = await ctx.tx
    .select()
    .from(estimateRevisions)
    .where(eq(estimateRevisions.jobId, job.id))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  if (!latest) throw new AppError("not_found", "That estimate was not found.");
  if (latest.id !== input.revisionId) {
    const [asked] = await ctx.tx
      .select({ id: estimateRevisions.id })
      .from(estimateRevisions)
      .where(and(eq(estimateRevisions.id, input.revisionId), eq(estimateRevisions.jobId, job.id)))
      .limit(1);
    if (!asked) throw new AppError("not_found", "That estimate was not found.");
    throw new AppError("stale", "The shop has sent a newer revision of this estimate. Please read it before deciding.");
  }
  if (job.state !== "estimate_sent" || latest.status !== "sent") {
    throw new AppError("conflict", "This estimate has already been decided.");
  }
  return { job, revision: latest };
}

/**
 * The owner approves the current revision. When deposits already paid on this job cover the new revision's
 * deposit (a revision sent during the work), the job goes straight on: there is nothing new to collect.
 */
export async function approveRevision(ctx: TxContext, input: DecisionInput) {
  const { job, revision } = await pendingRevision(ctx, input);
  const now = new Date();
  await ctx.tx
    .update(estimateRevisions)
    .set({ status: "approved", decidedBy: input.customerId, decidedAt: now })
    .where(eq(estimateRevisions.id, revision.id));
  await transitionJob(ctx, {
    jobId: job.id,
    to: "approved",
    actor: "customer",
    actorId: input.customerId,
    note: `Revision ${revision.revision} approved`,
  });
  await audit(ctx, {
    actorId: input.customerId,
    action: "estimate.approve",
    entity: "estimate_revision",
    entityId: revision.id,
    before: { status: "sent" },
    after: { status: "approved", totalMinor: revision.totalMinor, depositMinor: revision.depositMinor },
  });
  const depositDue = revision.depositMinor - (await paidDeposits(ctx, job.id));
  if (depositDue <= 0) {
    await transitionJob(ctx, {
      jobId: job.id,
      to: "deposit_paid",
      actor: "system",
      actorId: null,
      note: "Deposit already covered by an earlier payment",
    });
  }
  return { revisionId: revision.id, depositDueMinor: Math.max(0, depositDue) };
}

export async function declineRevision(ctx: TxContext, input: DecisionInput & { reason: string }) {
  const { job, revision } = await pendingRevision(ctx, input);
  await ctx.tx
    .update(estimateRevisions)
    .set({ status: "declined", decidedBy: input.customerId, decidedAt: new Date(), declineReason: input.reason })
    .where(eq(estimateRevisions.id, revision.id));
  await transitionJob(ctx, { jobId: job.id, to: "declined_by_owner", actor: "customer", actorId: input.customerId, note: input.reason });
  await audit(ctx, {
    actorId: input.customerId,
    action: "estimate.decline",
    entity: "estimate_revision",
    entityId: revision.id,
    before: { status: "sent" },
    after: { status: "declined", reason: input.reason },
  });
  return { revisionId: revision.id };
}

export async function paidDeposits(ctx: TxContext, jobId: string): Promise<number> {
  const [row] = await ctx.tx
    .select({ total: sql<string>`coalesce(sum(${payments.amountMinor}), 0)` })
    .from(payments)
    .where(and(eq(payments.jobId, jobId), eq(payments.purpose, "deposit"), eq(payments.status, "paid")));
  return Number(row?.total ?? 0);
}
