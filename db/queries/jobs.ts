import { and, desc, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { jobs, messageReads, messages, radioSets } from "@/db/schema";

export async function listJobsForCustomer({ customerId }: { customerId: string }) {
  return db
    .select({
      id: jobs.id,
      number: jobs.number,
      state: jobs.state,
      createdAt: jobs.createdAt,
      updatedAt: jobs.updatedAt,
      isWarranty: jobs.isWarranty,
      returnMethod: jobs.returnMethod,
      receivedAt: jobs.receivedAt,
      maker: radioSets.maker,
      model: radioSets.model,
      year: radioSets.year,
      // The shop's messages (never workshop notes) written after the owner last read the thread.
      unread: sql<number>`(select count(*)::int from ${messages} m
        where m.job_id = ${jobs.id} and not m.internal and m.author_id <> ${customerId}
          and m.created_at > coalesce((select r.read_up_to from ${messageReads} r where r.job_id = ${jobs.id} and r.user_id = ${customerId}), '-infinity'))`,
    })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(eq(jobs.customerId, customerId))
    .orderBy(desc(jobs.updatedAt));
}

// Another customer's job is simply not found.
export async function getJobForCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  const [row] = await db
    .select({ job: jobs, set: radioSets })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(and(eq(jobs.id, jobId), eq(jobs.customerId, customerId)))
    .limit(1);
  return row ?? null;
}

export async function getJobForStaff({ jobId }: { jobId: string }) {
  const [row] = await db
    .select({ job: jobs, set: radioSets })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(eq(jobs.id, jobId))
    .limit(1);
  return row ?? null;
}
