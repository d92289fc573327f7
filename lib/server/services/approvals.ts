import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { estimateLines, estimateRevisions, jobs, radioSets, user } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { AppError } from "@/lib/server/errors";
import type { DecisionMedium } from "@/lib/engine/contacts";
import { depositToCollect } from "@/lib/engine/pricing/deposit";
import { loadJobAccount, settleIfNothingOwed } from "@/lib/server/services/account";
import { syncTasks } from "@/lib/server/services/estimates";
import { transitionJob } from "@/lib/server/services/jobs";
import { notifyStaff } from "@/lib/server/services/notifications";
import { jobNumber } from "@/lib/engine/jobs/states";
import { moneyText } from "@/lib/validation/estimate";
import { takeStockForRevision } from "@/lib/server/services/parts";

/**
 * A decision the owner gave in person, by phone or in writing, typed in by staff for them: the revision keeps
 * the owner as the one who decided and names who recorded it, how, and what was said; the audit row's actor is
 * the staff member.
 */
export type RecordedBy = { staffId: string; medium: DecisionMedium; note: string };
type DecisionInput = { jobId: string; customerId: string; revisionId: string; recorded?: RecordedBy };

const recordedColumns = (r: RecordedBy | undefined) =>
  r ? { decisionRecordedBy: r.staffId, decisionMedium: r.medium, decisionNote: r.note } : {};
const recordedAudit = (r: RecordedBy | undefined, customerId: string) =>
  r ? { recordedFor: customerId, medium: r.medium, note: r.note } : {};

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
  if ((job.state !== "estimate_sent" && job.state !== "bench_revision") || latest.status !== "sent") {
    throw new AppError("conflict", "This estimate has already been decided.");
  }
  return { job, revision: latest };
}

/**
 * The owner approves the current revision. When deposits already paid on this job cover the new revision's
 * deposit (a revision sent before the set came in), the job goes straight on: there is nothing new to collect.
 * A revision sent while the set is on the bench sends it back to the bench: no deposit is asked and the
 * difference is settled in the balance (or owed back).
 */
export async function approveRevision(ctx: TxContext, input: DecisionInput) {
  const { job, revision } = await pendingRevision(ctx, input);
  const now = new Date();
  await ctx.tx
    .update(estimateRevisions)
    .set({ status: "approved", decidedBy: input.customerId, decidedAt: now, ...recordedColumns(input.recorded) })
    .where(eq(estimateRevisions.id, revision.id));
  const actorId = input.recorded?.staffId ?? input.customerId;
  await audit(ctx, {
    actorId,
    action: input.recorded ? "estimate.approve_recorded" : "estimate.approve",
    entity: "estimate_revision",
    entityId: revision.id,
    before: { status: "sent" },
    after: {
      status: "approved",
      totalMinor: revision.totalMinor,
      depositMinor: revision.depositMinor,
      ...recordedAudit(input.recorded, input.customerId),
    },
  });
  await notifyDecision(ctx, job, revision, "approved", job.state === "bench_revision" ? "The work goes on at the bench." : "");
  await takeStockForRevision(ctx, { jobId: job.id, revisionId: revision.id, actorId: input.customerId });
  if (job.state === "bench_revision") {
    await syncTasksToRevision(ctx, job.id, revision.id);
    await transitionJob(ctx, {
      jobId: job.id,
      to: "on_bench",
      actor: "customer",
      actorId,
      note: `Revision ${revision.revision} approved at the bench${input.recorded ? ` (${recordedWords(input.recorded)})` : ""}; the difference is settled in the balance`,
    });
    return { revisionId: revision.id, depositDueMinor: 0 };
  }
  await transitionJob(ctx, {
    jobId: job.id,
    to: "approved",
    actor: "customer",
    actorId,
    note: `Revision ${revision.revision} approved${input.recorded ? ` (${recordedWords(input.recorded)})` : ""}`,
  });
  const { account, paidDepositsMinor, processorMinimumMinor } = await loadJobAccount(ctx.tx, job.id);
  const difference = revision.depositMinor - paidDepositsMinor;
  // A difference below the processor's smallest charge cannot be asked for online: it joins the balance.
  const depositDue = depositToCollect(
    { depositMinor: revision.depositMinor, paidDepositsMinor, owedMinor: account.owedMinor },
    processorMinimumMinor,
  );
  if (depositDue === 0) {
    await transitionJob(ctx, {
      jobId: job.id,
      to: "deposit_paid",
      actor: "system",
      actorId: null,
      note:
        revision.depositMinor === 0
          ? "No deposit to pay"
          : difference <= 0
            ? "Deposit already covered by an earlier payment"
            : "The rest of the deposit is below the smallest card payment and is settled with the balance",
    });
  }
  return { revisionId: revision.id, depositDueMinor: depositDue };
}

export type AfterDecline = "approved-scope" | "return-as-is";

/**
 * The owner declines the current revision. Before the work, that ends the job. At the bench the owner also
 * chooses: carry on with the scope approved before (back to the bench, the checklist as it was), or stop the
 * work and have the set returned as it is — what has been paid settles the job, and it moves on to its return.
 */
export async function declineRevision(ctx: TxContext, input: DecisionInput & { reason: string; afterDecline?: AfterDecline }) {
  const { job, revision } = await pendingRevision(ctx, input);
  const atBench = job.state === "bench_revision";
  if (atBench && !input.afterDecline) {
    throw new AppError("invalid_input", "Your set is on the bench: choose how to go on.", {
      afterDecline: 'Choose "carry on with the work I approved before" or "return my set as it is".',
    });
  }
  await ctx.tx
    .update(estimateRevisions)
    .set({
      status: "declined",
      decidedBy: input.customerId,
      decidedAt: new Date(),
      declineReason: input.reason,
      ...recordedColumns(input.recorded),
    })
    .where(eq(estimateRevisions.id, revision.id));
  const actorId = input.recorded?.staffId ?? input.customerId;
  await audit(ctx, {
    actorId,
    action: input.recorded ? "estimate.decline_recorded" : "estimate.decline",
    entity: "estimate_revision",
    entityId: revision.id,
    before: { status: "sent" },
    after: {
      status: "declined",
      reason: input.reason,
      ...(atBench ? { afterDecline: input.afterDecline } : {}),
      ...recordedAudit(input.recorded, input.customerId),
    },
  });
  await notifyDecision(
    ctx,
    job,
    revision,
    "declined",
    `Reason: ${input.reason}${
      !atBench ? "" : input.afterDecline === "approved-scope" ? "\nCarry on with the work approved before." : "\nReturn the set as it is."
    }`,
  );
  if (!atBench) {
    await transitionJob(ctx, { jobId: job.id, to: "declined_by_owner", actor: "customer", actorId, note: input.reason });
    return { revisionId: revision.id };
  }
  if (input.afterDecline === "approved-scope") {
    const approved = await latestApproved(ctx, job.id);
    if (approved) await syncTasksToRevision(ctx, job.id, approved.id);
    await transitionJob(ctx, {
      jobId: job.id,
      to: "on_bench",
      actor: "customer",
      actorId,
      note: `Revision ${revision.revision} declined (${input.reason}); the work goes on as approved before`,
    });
    return { revisionId: revision.id };
  }
  // Returned as is: the work stops here and what the shop holds is what it cost.
  const { account } = await loadJobAccount(ctx.tx, job.id);
  await transitionJob(ctx, {
    jobId: job.id,
    to: "balance_due",
    actor: "customer",
    actorId,
    note: `Revision ${revision.revision} declined (${input.reason}); the owner asked for the set back as it is`,
    patch: { settledTotalMinor: Math.max(0, account.heldMinor), completedAt: new Date() },
  });
  await settleIfNothingOwed(ctx, job.id);
  return { revisionId: revision.id };
}

type Revision = Awaited<ReturnType<typeof pendingRevision>>["revision"];
type JobRow = Awaited<ReturnType<typeof pendingRevision>>["job"];

// The owner's decision reaches the technician holding the job, else the shop, with the same transaction.
async function notifyDecision(ctx: TxContext, job: JobRow, revision: Revision, decision: "approved" | "declined", detail: string) {
  const [row] = await ctx.tx
    .select({ name: user.name, maker: radioSets.maker, model: radioSets.model })
    .from(radioSets)
    .innerJoin(user, eq(user.id, job.customerId))
    .where(eq(radioSets.id, job.setId))
    .limit(1);
  const exponent = typeof revision.pricing.exponent === "number" ? revision.pricing.exponent : 2;
  const total = moneyText(revision.totalMinor, revision.currency, exponent);
  await notifyStaff(ctx, {
    kind: "estimate_decided",
    jobId: job.id,
    technicianId: job.technicianId,
    actorId: job.customerId,
    title: `Estimate ${decision} on ${jobNumber(job.number)}${row ? `: ${row.maker} ${row.model}` : ""}`,
    body: `${row?.name ?? "The owner"} ${decision} revision ${revision.revision} (${total}).${detail ? `\n${detail}` : ""}`,
    dedupeKey: `estimate:${revision.id}`,
  });
}

async function latestApproved(ctx: TxContext, jobId: string) {
  const [row] = await ctx.tx
    .select()
    .from(estimateRevisions)
    .where(and(eq(estimateRevisions.jobId, jobId), eq(estimateRevisions.status, "approved")))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  return row ?? null;
}

// The checklist ticked at the bench follows the labour lines of the scope the owner agreed to; ticked lines stay.
async function syncTasksToRevision(ctx: TxContext, jobId: string, revisionId: string) {
  const lines = await ctx.tx.select().from(estimateLines).where(eq(estimateLines.revisionId, revisionId));
  const labour = lines.filter((l) => l.category !== "parts" && l.partCostMinor === null);
  await syncTasks(ctx, jobId, labour);
}

const MEDIUM_WORDS: Record<DecisionMedium, string> = {
  "in-person": "given in person",
  phone: "given by phone",
  letter: "given in writing",
};
function recordedWords(r: RecordedBy): string {
  return `${MEDIUM_WORDS[r.medium]}, recorded by staff`;
}
