import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { documentCounters, estimateRevisions, moneyDocuments, payments, refunds, type MoneyDocument } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { dayInZone } from "@/lib/engine/dates";
import { formatDocumentNumber, seriesYear, type MoneyDocumentKind } from "@/lib/engine/documents/numbering";
import { audit } from "@/lib/server/audit";
import { readShopTimeZone } from "@/lib/server/services/shop";

// Receipts (a payment received, by card or at the counter), refund notes (a refund the processor confirmed)
// and invoices (the job's final account). Each is issued in the transaction that records the money (or moves
// the job to "paid in full", for the invoice), with the next number of its series: the series' counter row is
// taken FOR UPDATE, so a transaction that rolls back gives its number back and two at once queue for it.

/** The next number of a series, allocated under the counter row's lock (held until the caller commits). */
async function allocate(ctx: TxContext, kind: MoneyDocumentKind, year: number): Promise<number> {
  await ctx.tx.insert(documentCounters).values({ kind, year, lastNumber: 0 }).onConflictDoNothing();
  const [counter] = await ctx.tx
    .select({ lastNumber: documentCounters.lastNumber })
    .from(documentCounters)
    .where(and(eq(documentCounters.kind, kind), eq(documentCounters.year, year)))
    .for("update")
    .limit(1);
  const next = counter!.lastNumber + 1;
  await ctx.tx
    .update(documentCounters)
    .set({ lastNumber: next })
    .where(and(eq(documentCounters.kind, kind), eq(documentCounters.year, year)));
  return next;
}

async function issue(
  ctx: TxContext,
  input: {
    kind: MoneyDocumentKind;
    jobId: string;
    paymentId?: string;
    refundId?: string;
    revisionId?: string | null;
    actorId?: string | null;
  },
): Promise<MoneyDocument> {
  const issuedAt = new Date();
  const year = seriesYear(dayInZone(issuedAt, await readShopTimeZone(ctx.tx)));
  const sequence = await allocate(ctx, input.kind, year);
  const number = formatDocumentNumber(input.kind, year, sequence);
  const [row] = await ctx.tx
    .insert(moneyDocuments)
    .values({
      kind: input.kind,
      year,
      sequence,
      number,
      jobId: input.jobId,
      paymentId: input.paymentId ?? null,
      refundId: input.refundId ?? null,
      revisionId: input.revisionId ?? null,
      issuedAt,
    })
    .returning();
  await audit(ctx, {
    actorId: input.actorId ?? null,
    action: `document.${input.kind}`,
    entity: "money_document",
    entityId: row!.id,
    before: null,
    after: { number, jobId: input.jobId, paymentId: input.paymentId ?? null, refundId: input.refundId ?? null },
  });
  return row!;
}

/** The receipt of a payment received (paid, or a duplicate charge: money the shop holds either way); once. */
export async function issueReceipt(ctx: TxContext, paymentId: string, actorId: string | null = null): Promise<MoneyDocument> {
  const [existing] = await ctx.tx
    .select()
    .from(moneyDocuments)
    .where(and(eq(moneyDocuments.kind, "receipt"), eq(moneyDocuments.paymentId, paymentId)))
    .limit(1);
  if (existing) return existing;
  const [p] = await ctx.tx.select({ jobId: payments.jobId }).from(payments).where(eq(payments.id, paymentId)).limit(1);
  return issue(ctx, { kind: "receipt", jobId: p!.jobId, paymentId, actorId });
}

/** The refund note of a refund the processor confirmed; once. */
export async function issueRefundNote(ctx: TxContext, refundId: string, actorId: string | null = null): Promise<MoneyDocument> {
  const [existing] = await ctx.tx
    .select()
    .from(moneyDocuments)
    .where(and(eq(moneyDocuments.kind, "refund"), eq(moneyDocuments.refundId, refundId)))
    .limit(1);
  if (existing) return existing;
  const [r] = await ctx.tx
    .select({ jobId: payments.jobId, paymentId: refunds.paymentId })
    .from(refunds)
    .innerJoin(payments, eq(payments.id, refunds.paymentId))
    .where(eq(refunds.id, refundId))
    .limit(1);
  return issue(ctx, { kind: "refund", jobId: r!.jobId, paymentId: r!.paymentId, refundId, actorId });
}

/**
 * The job's invoice, issued when it moves to "paid in full": the final account is known (the approved
 * revision, or the total the work stopped at) and nothing is left to pay. Once per job; a later move never
 * issues another or renumbers it.
 */
export async function issueInvoice(ctx: TxContext, jobId: string): Promise<MoneyDocument | null> {
  const [existing] = await ctx.tx
    .select()
    .from(moneyDocuments)
    .where(and(eq(moneyDocuments.kind, "invoice"), eq(moneyDocuments.jobId, jobId)))
    .limit(1);
  if (existing) return existing;
  // The revision the account's total comes from (loadJobAccount's choice: the newest approved one).
  const [revision] = await ctx.tx
    .select({ id: estimateRevisions.id })
    .from(estimateRevisions)
    .where(and(eq(estimateRevisions.jobId, jobId), eq(estimateRevisions.status, "approved")))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  if (!revision) return null;
  return issue(ctx, { kind: "invoice", jobId, revisionId: revision.id });
}
