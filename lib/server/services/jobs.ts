import "server-only";
import { and, eq } from "drizzle-orm";
import { jobs, jobStateHistory } from "@/db/schema";
import type { JobState } from "@/lib/engine/jobs/states";
import type { TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { AppError } from "@/lib/server/errors";
import { canTransition, STATE_LABEL, type Actor } from "@/lib/engine/jobs/states";

export type TransitionInput = {
  jobId: string;
  to: JobState;
  actor: Actor;
  actorId: string | null;
  note?: string | null;
  // Extra columns changed with the state (returned-at, carrier…), in the same statement.
  patch?: Partial<typeof jobs.$inferInsert>;
};

// The only way a job changes state: checks the move, locks the row, writes history and audit in the caller's
// transaction. An illegal move is a 409 and leaves the job untouched.
export async function transitionJob(ctx: TxContext, input: TransitionInput) {
  const [current] = await ctx.tx.select().from(jobs).where(eq(jobs.id, input.jobId)).for("update").limit(1);
  if (!current) throw new AppError("not_found", "That job was not found.");
  if (!canTransition(current.state, input.to, input.actor)) {
    throw new AppError(
      "invalid_transition",
      `A job that is "${STATE_LABEL[current.state].staff}" cannot move to "${STATE_LABEL[input.to].staff}".`,
    );
  }
  const [updated] = await ctx.tx
    .update(jobs)
    .set({ ...input.patch, state: input.to, version: current.version + 1, updatedAt: new Date() })
    .where(and(eq(jobs.id, input.jobId), eq(jobs.state, current.state)))
    .returning();
  if (!updated) throw new AppError("conflict", "The job changed while you were working on it. Reload and try again.");
  await ctx.tx
    .insert(jobStateHistory)
    .values({ jobId: input.jobId, fromState: current.state, toState: input.to, actorId: input.actorId, note: input.note ?? null });
  await audit(ctx, {
    actorId: input.actorId,
    action: "job.transition",
    entity: "job",
    entityId: input.jobId,
    before: { state: current.state },
    after: { state: input.to, ...(input.note ? { note: input.note } : {}) },
  });
  return { before: current, after: updated };
}

// The first history row of a new job (no "from" state).
export async function recordJobCreated(ctx: TxContext, { jobId, actorId }: { jobId: string; actorId: string }) {
  await ctx.tx.insert(jobStateHistory).values({ jobId, fromState: null, toState: "requested", actorId });
  await audit(ctx, { actorId, action: "job.create", entity: "job", entityId: jobId, before: null, after: { state: "requested" } });
}
