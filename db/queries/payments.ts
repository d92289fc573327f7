import { and, desc, eq, inArray, sql } from "drizzle-orm";
import { db, type Database } from "@/db";
import { estimateRevisions, jobs, payments, refunds } from "@/db/schema";

// Payments of one customer's job; another customer's job gives an empty list.
export async function listPaymentsForCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  return db
    .select({
      id: payments.id,
      purpose: payments.purpose,
      amountMinor: payments.amountMinor,
      currency: payments.currency,
      status: payments.status,
      refundedMinor: payments.refundedMinor,
      createdAt: payments.createdAt,
      paidAt: payments.paidAt,
      revisionId: payments.revisionId,
    })
    .from(payments)
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .where(and(eq(payments.jobId, jobId), eq(jobs.customerId, customerId)))
    .orderBy(desc(payments.createdAt));
}

// Refunds on one customer's job (amount and status only), for the job's account.
export async function listRefundsForCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  return db
    .select({ amountMinor: refunds.amountMinor, status: refunds.status, kind: refunds.kind })
    .from(refunds)
    .innerJoin(payments, eq(payments.id, refunds.paymentId))
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .where(and(eq(payments.jobId, jobId), eq(jobs.customerId, customerId)));
}

export async function getPaymentForCustomer({ paymentId, customerId }: { paymentId: string; customerId: string }) {
  const [row] = await db
    .select({
      id: payments.id,
      jobId: payments.jobId,
      purpose: payments.purpose,
      amountMinor: payments.amountMinor,
      currency: payments.currency,
      status: payments.status,
      refundedMinor: payments.refundedMinor,
      createdAt: payments.createdAt,
      paidAt: payments.paidAt,
    })
    .from(payments)
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .where(and(eq(payments.id, paymentId), eq(jobs.customerId, customerId)))
    .limit(1);
  return row ?? null;
}

export async function getPaymentBySessionForCustomer({ sessionId, customerId }: { sessionId: string; customerId: string }) {
  const [row] = await db
    .select({ id: payments.id, jobId: payments.jobId, purpose: payments.purpose, status: payments.status })
    .from(payments)
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .where(and(eq(payments.checkoutSessionId, sessionId), eq(jobs.customerId, customerId)))
    .limit(1);
  return row ?? null;
}

// The newest approved revision of a job: what the owner agreed to pay.
export async function getLatestApprovedRevision(tx: Database, { jobId }: { jobId: string }) {
  const [row] = await tx
    .select()
    .from(estimateRevisions)
    .where(and(eq(estimateRevisions.jobId, jobId), eq(estimateRevisions.status, "approved")))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  return row ?? null;
}

// Open or in-flight checkouts for one revision and purpose (a double click reuses them).
export async function listLiveCheckouts(tx: Database, { revisionId, purpose }: { revisionId: string; purpose: "deposit" | "balance" }) {
  return tx
    .select()
    .from(payments)
    .where(
      and(eq(payments.revisionId, revisionId), eq(payments.purpose, purpose), inArray(payments.status, ["open", "processing", "paid"])),
    )
    .orderBy(desc(payments.createdAt));
}

export async function countCheckouts(
  tx: Database,
  { revisionId, purpose }: { revisionId: string; purpose: "deposit" | "balance" },
): Promise<number> {
  const [row] = await tx
    .select({ n: sql<string>`count(*)` })
    .from(payments)
    .where(and(eq(payments.revisionId, revisionId), eq(payments.purpose, purpose)));
  return Number(row?.n ?? 0);
}
