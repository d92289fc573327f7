import { and, asc, desc, eq, inArray, isNull } from "drizzle-orm";
import { db } from "@/db";
import { estimateLines, estimateRevisions, jobs, jobStateHistory, messages, photos, radioSets, user } from "@/db/schema";
import { revisionSummaryColumns } from "./estimates";

// Everything here is scoped to one customer: another customer's ids simply find nothing.

export async function getPortalJobForCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  const [row] = await db
    .select({
      id: jobs.id,
      number: jobs.number,
      state: jobs.state,
      symptoms: jobs.symptoms,
      priorWork: jobs.priorWork,
      poweredRecently: jobs.poweredRecently,
      delivery: jobs.delivery,
      contactPreference: jobs.contactPreference,
      isWarranty: jobs.isWarranty,
      returnMethod: jobs.returnMethod,
      receivedAt: jobs.receivedAt,
      carrier: jobs.carrier,
      trackingNumber: jobs.trackingNumber,
      returnAddress: jobs.returnAddress,
      settledTotalMinor: jobs.settledTotalMinor,
      waivedMinor: jobs.waivedMinor,
      waivedAt: jobs.waivedAt,
      createdAt: jobs.createdAt,
      updatedAt: jobs.updatedAt,
      set: {
        maker: radioSets.maker,
        model: radioSets.model,
        year: radioSets.year,
        serial: radioSets.serial,
        kind: radioSets.kind,
        profile: radioSets.profile,
      },
    })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(and(eq(jobs.id, jobId), eq(jobs.customerId, customerId)))
    .limit(1);
  return row ?? null;
}

export async function listTimelineForCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  return db
    .select({ id: jobStateHistory.id, fromState: jobStateHistory.fromState, toState: jobStateHistory.toState, at: jobStateHistory.at })
    .from(jobStateHistory)
    .innerJoin(jobs, eq(jobs.id, jobStateHistory.jobId))
    .where(and(eq(jobStateHistory.jobId, jobId), eq(jobs.customerId, customerId)))
    .orderBy(asc(jobStateHistory.at));
}

// Internal notes are filtered here, in SQL, so they cannot leak through a later change to the page.
export async function listMessagesForCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  return db
    .select({
      id: messages.id,
      body: messages.body,
      isQuestion: messages.isQuestion,
      createdAt: messages.createdAt,
      authorId: messages.authorId,
      authorName: user.name,
      authorRole: user.role,
    })
    .from(messages)
    .innerJoin(jobs, eq(jobs.id, messages.jobId))
    .innerJoin(user, eq(user.id, messages.authorId))
    .where(and(eq(messages.jobId, jobId), eq(jobs.customerId, customerId), eq(messages.internal, false)))
    .orderBy(asc(messages.createdAt));
}

export async function listPhotosForCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  return db
    .select({ id: photos.id, displayName: photos.displayName, width: photos.width, height: photos.height, createdAt: photos.createdAt })
    .from(photos)
    .innerJoin(jobs, eq(jobs.id, photos.jobId))
    .where(and(eq(photos.jobId, jobId), eq(jobs.customerId, customerId), isNull(photos.messageId)))
    .orderBy(asc(photos.createdAt));
}

// Revisions the owner has seen, newest first, with their lines. Cost prices and markups are not selected.
export async function listRevisionsForCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  const revisions = await db
    .select({
      ...revisionSummaryColumns,
      decidedAt: estimateRevisions.decidedAt,
      declineReason: estimateRevisions.declineReason,
    })
    .from(estimateRevisions)
    .innerJoin(jobs, eq(jobs.id, estimateRevisions.jobId))
    .where(and(eq(estimateRevisions.jobId, jobId), eq(jobs.customerId, customerId)))
    .orderBy(desc(estimateRevisions.revision));
  if (!revisions.length) return [];
  const lines = await db
    .select({
      revisionId: estimateLines.revisionId,
      id: estimateLines.id,
      position: estimateLines.position,
      title: estimateLines.title,
      category: estimateLines.category,
      minutes: estimateLines.minutes,
      quantity: estimateLines.quantity,
      reason: estimateLines.reason,
      labourMinor: estimateLines.labourMinor,
      partsMinor: estimateLines.partsMinor,
      coveredByWarranty: estimateLines.coveredByWarranty,
    })
    .from(estimateLines)
    .where(
      inArray(
        estimateLines.revisionId,
        revisions.map((r) => r.id),
      ),
    )
    .orderBy(asc(estimateLines.position));
  return revisions.map((r) => ({ ...r, lines: lines.filter((l) => l.revisionId === r.id) }));
}
