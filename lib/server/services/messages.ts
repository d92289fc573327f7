import "server-only";
import { and, eq } from "drizzle-orm";
import { jobs, messages } from "@/db/schema";
import { transaction, type TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { AppError } from "@/lib/server/errors";
import { transitionJob } from "@/lib/server/services/jobs";

type Author = { id: string; side: "customer" | "staff" };

export type KeyedMessage = {
  jobId: string;
  authorId: string;
  idempotencyKey: string;
  body: string;
  internal: boolean;
  isQuestion: boolean;
};

export const KEY_REUSED_MESSAGE =
  "This message key was already used for a different message. Reload the page to see what was sent, then send your text again.";

/**
 * The message this author already stored on this job under this key: a repeat of the same post (a retry
 * after a lost answer) gets the original back and stores nothing; the same key with other content is
 * refused. Call it after locking the job row, so two posts with one key cannot both miss each other.
 */
export async function findKeyedMessage(ctx: TxContext, m: KeyedMessage): Promise<{ id: string; createdAt: Date } | null> {
  const [row] = await ctx.tx
    .select({
      id: messages.id,
      createdAt: messages.createdAt,
      body: messages.body,
      internal: messages.internal,
      isQuestion: messages.isQuestion,
    })
    .from(messages)
    .where(and(eq(messages.authorId, m.authorId), eq(messages.jobId, m.jobId), eq(messages.idempotencyKey, m.idempotencyKey)))
    .limit(1);
  if (!row) return null;
  if (row.body !== m.body || row.internal !== m.internal || row.isQuestion !== m.isQuestion) {
    throw new AppError("conflict", KEY_REUSED_MESSAGE, { idempotencyKey: KEY_REUSED_MESSAGE });
  }
  return { id: row.id, createdAt: row.createdAt };
}

function isKeyViolation(e: unknown): boolean {
  const err = e as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } };
  const code = err.code ?? err.cause?.code;
  const constraint = err.constraint ?? err.cause?.constraint;
  return code === "23505" && constraint === "message_idempotency_key_idx";
}

/**
 * Runs a message post in its own transaction. The job lock makes a second post with the same key wait and
 * then find the first; should two ever race past it anyway, the unique index refuses one, and running it
 * again answers with the stored message.
 */
export async function inMessageTransaction<T>(fn: (ctx: TxContext) => Promise<T>): Promise<T> {
  try {
    return await transaction(fn);
  } catch (e) {
    if (!isKeyViolation(e)) throw e;
    return transaction(fn);
  }
}

/**
 * One message on a job's thread. Customers write only on their own jobs and never internal notes; an answer
 * while the shop is waiting on the owner sends the job back to triage. Staff may mark a note internal.
 * The same idempotency key from the same author on the same job returns the first message (duplicate: true)
 * without a second row, audit entry or state change.
 */
export async function postMessage(
  ctx: TxContext,
  input: { jobId: string; author: Author; body: string; idempotencyKey: string; internal?: boolean },
): Promise<{ id: string; createdAt: Date; duplicate: boolean }> {
  const where =
    input.author.side === "customer" ? and(eq(jobs.id, input.jobId), eq(jobs.customerId, input.author.id)) : eq(jobs.id, input.jobId);
  const [job] = await ctx.tx.select({ id: jobs.id, state: jobs.state }).from(jobs).where(where).for("update").limit(1);
  if (!job) throw new AppError("not_found", "That job was not found.");
  const internal = input.author.side === "staff" && input.internal === true;
  const keyed: KeyedMessage = {
    jobId: job.id,
    authorId: input.author.id,
    idempotencyKey: input.idempotencyKey,
    body: input.body,
    internal,
    isQuestion: false,
  };
  const existing = await findKeyedMessage(ctx, keyed);
  if (existing) return { ...existing, duplicate: true };
  const [row] = await ctx.tx
    .insert(messages)
    .values({ jobId: job.id, authorId: input.author.id, body: input.body, internal, idempotencyKey: input.idempotencyKey })
    .returning({ id: messages.id, createdAt: messages.createdAt });
  await audit(ctx, {
    actorId: input.author.id,
    action: internal ? "message.internal" : "message.post",
    entity: "message",
    entityId: row!.id,
    before: null,
    after: { jobId: job.id },
  });
  if (input.author.side === "customer" && job.state === "awaiting_owner") {
    await transitionJob(ctx, { jobId: job.id, to: "in_triage", actor: "customer", actorId: input.author.id, note: "The owner answered" });
  }
  return { id: row!.id, createdAt: row!.createdAt, duplicate: false };
}
