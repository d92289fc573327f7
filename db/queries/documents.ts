import { and, asc, eq } from "drizzle-orm";
import { db } from "@/db";
import { jobs, moneyDocuments } from "@/db/schema";

// Receipts, refund notes and invoices. A set owner reaches only those of their own jobs; the office any.

export async function getMoneyDocumentForCustomer({ documentId, customerId }: { documentId: string; customerId: string }) {
  const [row] = await db
    .select({ document: moneyDocuments })
    .from(moneyDocuments)
    .innerJoin(jobs, eq(jobs.id, moneyDocuments.jobId))
    .where(and(eq(moneyDocuments.id, documentId), eq(jobs.customerId, customerId)))
    .limit(1);
  return row?.document ?? null;
}

export async function getMoneyDocumentForOffice({ documentId }: { documentId: string }) {
  const [row] = await db.select().from(moneyDocuments).where(eq(moneyDocuments.id, documentId)).limit(1);
  return row ?? null;
}

/** A job's documents in the order issued (the caller has checked the job is the viewer's or the office's). */
export async function listMoneyDocumentsForJob({ jobId }: { jobId: string }) {
  return db
    .select()
    .from(moneyDocuments)
    .where(eq(moneyDocuments.jobId, jobId))
    .orderBy(asc(moneyDocuments.issuedAt), asc(moneyDocuments.number));
}
