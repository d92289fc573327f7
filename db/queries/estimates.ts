import { asc, desc, eq, inArray } from "drizzle-orm";
import { db, type Database } from "@/db";
import { estimateLines, estimateRevisions, estimates, user } from "@/db/schema";

// Staff see the working draft, its version and every revision sent so far.
export async function getEstimateForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  const [row] = await tx
    .select({ estimate: estimates, updatedByName: user.name })
    .from(estimates)
    .leftJoin(user, eq(user.id, estimates.updatedBy))
    .where(eq(estimates.jobId, jobId))
    .limit(1);
  return row ?? null;
}

// What both sides see of a revision: its number, state, money and dates (never cost prices or markups).
export const revisionSummaryColumns = {
  id: estimateRevisions.id,
  revision: estimateRevisions.revision,
  status: estimateRevisions.status,
  currency: estimateRevisions.currency,
  labourMinor: estimateRevisions.labourMinor,
  partsMinor: estimateRevisions.partsMinor,
  taxMinor: estimateRevisions.taxMinor,
  totalMinor: estimateRevisions.totalMinor,
  depositMinor: estimateRevisions.depositMinor,
  pricing: estimateRevisions.pricing,
  changeSummary: estimateRevisions.changeSummary,
  sentAt: estimateRevisions.sentAt,
};

export async function listRevisionsForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  return tx
    .select({
      ...revisionSummaryColumns,
      sentByName: user.name,
      decidedAt: estimateRevisions.decidedAt,
      declineReason: estimateRevisions.declineReason,
    })
    .from(estimateRevisions)
    .leftJoin(user, eq(user.id, estimateRevisions.sentBy))
    .where(eq(estimateRevisions.jobId, jobId))
    .orderBy(desc(estimateRevisions.revision));
}

// The newest revision of a job with its lines, in position order (what the owner saw last).
export async function getLatestRevisionWithLines({ jobId }: { jobId: string }, tx: Database = db) {
  const [revision] = await tx
    .select()
    .from(estimateRevisions)
    .where(eq(estimateRevisions.jobId, jobId))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  if (!revision) return null;
  const lines = await tx.select().from(estimateLines).where(eq(estimateLines.revisionId, revision.id)).orderBy(asc(estimateLines.position));
  return { revision, lines };
}

// The revision the owner last approved (work and readings are held to it), or null.
export async function getApprovedRevisionWithLines({ jobId }: { jobId: string }, tx: Database = db) {
  const approved = await tx
    .select()
    .from(estimateRevisions)
    .where(eq(estimateRevisions.jobId, jobId))
    .orderBy(desc(estimateRevisions.revision));
  const revision = approved.find((r) => r.status === "approved");
  if (!revision) return null;
  const lines = await tx.select().from(estimateLines).where(eq(estimateLines.revisionId, revision.id)).orderBy(asc(estimateLines.position));
  return { revision, lines };
}

export async function listLinesForRevisions({ revisionIds }: { revisionIds: string[] }, tx: Database = db) {
  if (revisionIds.length === 0) return [];
  return tx.select().from(estimateLines).where(inArray(estimateLines.revisionId, revisionIds)).orderBy(asc(estimateLines.position));
}
