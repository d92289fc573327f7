import { and, eq } from "drizzle-orm";
import { jobs, messages } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { audit } from "@/lib/audit";
import { AppError } from "@/lib/errors";
import { transitionJob } from "@/lib/services/jobs";

type Author = { id: string; side: "customer" | "staff" };

/**
 * One message on a job's thread. Customers write only on their own jobs and never internal notes; an answer
 * while the shop is waiting on the owner sends the job back to triage. Staff may mark a note internal.
 */
export async function postMessage(ctx: TxContext, input: { jobId: string; author: Author; body: string; internal?: boolean }) {
  const where = input.author.side === "customer" ? and(eq(jobs.id, input.jobId), eq(jobs.customerId, input.author.id)) : eq(jobs.id, input.jobId);
  const [job] = await ctx.tx.select({ id: jobs.id, state: jobs.state }).from(jobs).where(where).for("update").limit(1);
  if (!job) throw new AppError("not_found", "That job was not found.");
  const internal = input.author.side === "staff" && input.internal === true;
  const [row] = await ctx.tx
    .insert(messages)
    .values({ jobId: job.id, authorId: input.author.id, body: input.body, internal })
    .returning({ id: messages.id, createdAt: messages.createdAt });
  await audit(ctx, { actorId: input.author.id, action: internal ? "message.internal" : "message.post", entity: "message", entityId: row!.id, before: null, after: { jobId: job.id } });
  if (input.author.side === "customer" && job.state === "awaiting_owner") {
    await transitionJob(ctx, { jobId: job.id, to: "in_triage", actor: "customer", actorId: input.author.id, note: "The owner answered" });
  }
  return { id: row!.id, createdAt: row!.createdAt };
}
