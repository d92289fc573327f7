import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";

// What a receipt, refund note, invoice or printable estimate says (issuing and numbering: document-numbers.ts).
import { db, type Database } from "@/db";
import {
  estimateLines,
  estimateRevisions,
  jobs,
  moneyDocuments,
  payments,
  radioSets,
  refunds,
  user,
  type MoneyDocument,
} from "@/db/schema";
import { formatDate, formatDay } from "@/lib/engine/dates";
import { DOCUMENT_TITLE, REFUND_NOTE_TITLE } from "@/lib/engine/documents/numbering";
import { jobNumber } from "@/lib/engine/jobs/states";
import { WAIVED_WORDING } from "@/lib/engine/pricing/account";
import { loadJobAccount } from "@/lib/server/services/account";
import { jobShipToLines } from "@/lib/server/services/owner-account";
import { shownEmail } from "@/lib/engine/contacts";
import { getShop } from "@/lib/server/services/shop";
import { moneyText } from "@/lib/validation/estimate";
import type { DocumentFigure, DocumentLine, MoneyPdfContent } from "@/lib/server/pdf/money-pdf";

export type { MoneyPdfContent };

// ---- what a document says ----

const METHOD_WORD = { card: "Card (online)", cash: "Cash", cheque: "Cheque" } as const;
const PURPOSE_WORD = { deposit: "Deposit", balance: "Balance" } as const;

function percentText(bp: number): string {
  return `${(bp / 100).toFixed(2).replace(/\.?0+$/, "")}%`;
}

async function jobHeader(tx: Database, jobId: string) {
  const [row] = await tx
    .select({ job: jobs, maker: radioSets.maker, model: radioSets.model, year: radioSets.year, name: user.name, email: user.email })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(eq(jobs.id, jobId))
    .limit(1);
  return row!;
}

/**
 * Where the set goes back: the address the owner chose for the job (kept on the job), else their default
 * address; nothing for a set collected at the counter (the document then says it is collected).
 */
async function shipToOf(job: { id: string; returnMethod: "pick-up" | "shipped" | null }): Promise<string[] | null> {
  if (job.returnMethod === "pick-up") return null;
  return (await jobShipToLines({ jobId: job.id }))?.lines ?? null;
}

async function shopBlock() {
  const shop = await getShop();
  return {
    shop,
    block: { name: shop.name, addressLines: shop.addressLines, phone: shop.phone, email: shop.email, taxNumber: shop.taxNumber },
  };
}

type RevisionRow = typeof estimateRevisions.$inferSelect;

/** The revision's lines and its tax by kind, as priced when it was sent (never recomputed here). */
async function revisionLines(tx: Database, revision: RevisionRow, money: (minor: number) => string) {
  const lines = await tx.select().from(estimateLines).where(eq(estimateLines.revisionId, revision.id)).orderBy(asc(estimateLines.position));
  const pricing = revision.pricing as {
    labourTaxMinor?: number;
    partsTaxMinor?: number;
    roundingLabourMinor?: number;
    tax?: { labourBp?: number; partsBp?: number };
  };
  const out: DocumentLine[] = lines.map((l) => {
    const isPart = l.category === "parts";
    const detail = l.coveredByWarranty
      ? "covered by warranty"
      : isPart
        ? `parts × ${l.quantity}`
        : `labour, ${l.minutes * l.quantity} min${l.quantity > 1 ? ` (${l.quantity} × ${l.minutes})` : ""}`;
    return { description: l.title, detail, amount: money(l.labourMinor + l.partsMinor) };
  });
  if ((pricing.roundingLabourMinor ?? 0) > 0)
    out.push({ description: "Labour rounded up to the billing increment", detail: "labour", amount: money(pricing.roundingLabourMinor!) });
  const labourTax = pricing.labourTaxMinor ?? 0;
  const partsTax = pricing.partsTaxMinor ?? revision.taxMinor - labourTax;
  const rate = (bp: number | undefined) => (bp === undefined ? "" : ` at ${percentText(bp)}`);
  const figures: DocumentFigure[] = [
    { label: "Labour", value: money(revision.labourMinor) },
    { label: "Parts", value: money(revision.partsMinor) },
    { label: `Tax on labour${rate(pricing.tax?.labourBp)}`, value: money(labourTax) },
    { label: `Tax on parts${rate(pricing.tax?.partsBp)}`, value: money(partsTax) },
    { label: "Total", value: money(revision.totalMinor), strong: true },
  ];
  return { lines: out, figures };
}

async function paymentFacts(tx: Database, jobId: string, money: (minor: number) => string, timeZone: string) {
  const rows = await tx
    .select({ payment: payments, receipt: moneyDocuments.number })
    .from(payments)
    .leftJoin(moneyDocuments, and(eq(moneyDocuments.paymentId, payments.id), eq(moneyDocuments.kind, "receipt")))
    .where(and(eq(payments.jobId, jobId), inArray(payments.status, ["paid", "duplicate"])))
    .orderBy(asc(payments.paidAt));
  const refundRows = await tx
    .select({ refund: refunds, note: moneyDocuments.number })
    .from(refunds)
    .innerJoin(payments, eq(payments.id, refunds.paymentId))
    .leftJoin(moneyDocuments, and(eq(moneyDocuments.refundId, refunds.id), eq(moneyDocuments.kind, "refund")))
    .where(and(eq(payments.jobId, jobId), eq(refunds.status, "succeeded")))
    .orderBy(asc(refunds.settledAt));
  const lines: DocumentLine[] = [
    ...rows.map(({ payment: p, receipt }) => ({
      description: `${PURPOSE_WORD[p.purpose]} received, ${METHOD_WORD[p.method].toLowerCase()}`,
      detail: [p.receivedOn ? formatDay(p.receivedOn) : formatDate(p.paidAt, { timeZone }), receipt].filter(Boolean).join(" · "),
      amount: money(p.amountMinor),
    })),
    ...refundRows.map(({ refund: r, note }) => ({
      description: r.kind === "reduction" ? "Price reduction, given back" : "Refunded",
      detail: [formatDate(r.settledAt, { timeZone }), note].filter(Boolean).join(" · "),
      amount: `−${money(r.amountMinor)}`,
    })),
  ];
  return lines;
}

/** The account's figures, from the one account of the job. */
function accountFigures(
  account: Awaited<ReturnType<typeof loadJobAccount>>["account"],
  money: (minor: number) => string,
): DocumentFigure[] {
  const f: DocumentFigure[] = [{ label: "Paid", value: money(account.paidMinor) }];
  if (account.reducedMinor > 0) f.push({ label: "Price reduced by (given back)", value: money(account.reducedMinor) });
  if (account.refundedMinor > 0) f.push({ label: "Refunded", value: money(account.refundedMinor) });
  if (account.waivedMinor > 0) f.push({ label: `Waived (${WAIVED_WORDING})`, value: money(account.waivedMinor) });
  f.push({ label: "Balance owed", value: money(account.owedMinor), strong: true });
  if (account.owedBackMinor > 0) f.push({ label: "Owed back to you", value: money(account.owedBackMinor), strong: true });
  return f;
}

/** What a receipt, refund note or invoice prints. */
export async function moneyDocumentContent(doc: MoneyDocument, options: { shipTo?: string[] | null } = {}): Promise<MoneyPdfContent> {
  const [{ shop, block }, head, loaded] = await Promise.all([shopBlock(), jobHeader(db, doc.jobId), loadJobAccount(db, doc.jobId)]);
  const shipTo = options.shipTo !== undefined ? options.shipTo : await shipToOf(head.job);
  const timeZone = shop.timeZone;
  const money = (minor: number) => moneyText(minor, loaded.currency, loaded.exponent);
  const base = {
    title: DOCUMENT_TITLE[doc.kind],
    number: doc.number,
    issuedOn: formatDate(doc.issuedAt, { timeZone }),
    shop: block,
    billTo: { name: head.name, email: shownEmail(head.email) },
    shipTo,
  };
  const setName = [head.maker, head.model, head.year ? `(${head.year})` : null].filter(Boolean).join(" ");
  const jobFacts: DocumentFigure[] = [
    { label: "Job", value: jobNumber(head.job.number) },
    { label: "Set", value: setName },
  ];
  if (doc.kind === "receipt") {
    const [p] = await db.select().from(payments).where(eq(payments.id, doc.paymentId!)).limit(1);
    const payment = p!;
    const facts: DocumentFigure[] = [
      ...jobFacts,
      { label: "Received", value: payment.receivedOn ? formatDay(payment.receivedOn) : formatDate(payment.paidAt, { timeZone }) },
      { label: "Method", value: METHOD_WORD[payment.method] + (payment.chequeNumber ? ` no. ${payment.chequeNumber}` : "") },
    ];
    if (payment.paymentIntentId) facts.push({ label: "Processor reference", value: payment.paymentIntentId });
    const notes: string[] = [];
    if (payment.status === "voided")
      notes.push(`VOID: this entry was made by mistake and does not count${payment.voidReason ? ` (${payment.voidReason})` : ""}.`);
    if (payment.status === "duplicate") notes.push("A second charge for something already paid: the shop holds it and owes it back.");
    return {
      ...base,
      facts,
      lines: [
        {
          description: `${PURPOSE_WORD[payment.purpose]} for ${jobNumber(head.job.number)}`,
          detail: setName,
          amount: money(payment.amountMinor),
        },
      ],
      figures: [{ label: "Amount received", value: money(payment.amountMinor), strong: true }],
      notes,
    };
  }
  if (doc.kind === "refund") {
    const [r] = await db
      .select({ refund: refunds, payment: payments, receipt: moneyDocuments.number })
      .from(refunds)
      .innerJoin(payments, eq(payments.id, refunds.paymentId))
      .leftJoin(moneyDocuments, and(eq(moneyDocuments.paymentId, payments.id), eq(moneyDocuments.kind, "receipt")))
      .where(eq(refunds.id, doc.refundId!))
      .limit(1);
    const { refund, payment, receipt } = r!;
    const reduction = refund.kind === "reduction";
    const facts: DocumentFigure[] = [
      ...jobFacts,
      { label: "Refunded on", value: formatDate(refund.settledAt, { timeZone }) },
      { label: "Against", value: receipt ?? `${PURPOSE_WORD[payment.purpose]} payment` },
    ];
    if (refund.processorRefundId) facts.push({ label: "Processor reference", value: refund.processorRefundId });
    const returnedTo = `Returned to the ${payment.method === "card" ? "card used for the payment" : "payer"}.`;
    return {
      ...base,
      title: REFUND_NOTE_TITLE[refund.kind],
      facts,
      lines: [{ description: reduction ? "Price reduction" : "Refund", detail: refund.reason, amount: money(refund.amountMinor) }],
      figures: [{ label: "Amount refunded", value: money(refund.amountMinor), strong: true }],
      notes: reduction
        ? [
            `The shop lowered the price of ${jobNumber(head.job.number)} by this amount and gave it back: it is not to be paid again.`,
            returnedTo,
          ]
        : [returnedTo],
    };
  }
  const [rev] = doc.revisionId ? await db.select().from(estimateRevisions).where(eq(estimateRevisions.id, doc.revisionId)).limit(1) : [];
  const revision = rev ?? loaded.revision!;
  const priced = await revisionLines(db, revision, money);
  const account = loaded.account;
  const figures = [...priced.figures];
  if (head.job.settledTotalMinor !== null && head.job.settledTotalMinor !== revision.totalMinor)
    figures.push({ label: "Total as settled (work stopped before the end)", value: money(account.totalMinor), strong: true });
  figures.push({ label: "Deposit asked", value: money(revision.depositMinor) });
  figures.push(...accountFigures(account, money));
  return {
    ...base,
    facts: [...jobFacts, { label: "Estimate", value: `revision ${revision.revision}` }],
    lines: [...priced.lines, ...(await paymentFacts(db, doc.jobId, money, timeZone))],
    figures,
    notes: ["Tax is charged on labour and on parts at the shop's rates, as on the approved estimate."],
  };
}

/** The printable estimate: the job's newest revision as sent to the owner, whatever its status. */
export async function estimateContent(jobId: string, options: { shipTo?: string[] | null } = {}): Promise<MoneyPdfContent | null> {
  const [revision] = await db
    .select()
    .from(estimateRevisions)
    .where(eq(estimateRevisions.jobId, jobId))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  if (!revision) return null;
  const [{ shop, block }, head] = await Promise.all([shopBlock(), jobHeader(db, jobId)]);
  const shipTo = options.shipTo !== undefined ? options.shipTo : await shipToOf(head.job);
  const exponent = typeof revision.pricing.exponent === "number" ? revision.pricing.exponent : 2;
  const money = (minor: number) => moneyText(minor, revision.currency, exponent);
  const priced = await revisionLines(db, revision, money);
  const status = { sent: "waiting for your decision", approved: "approved", declined: "declined", superseded: "superseded" }[
    revision.status
  ];
  return {
    title: "Estimate",
    number: null,
    issuedOn: formatDate(revision.sentAt, { timeZone: shop.timeZone }),
    shop: block,
    billTo: { name: head.name, email: shownEmail(head.email) },
    shipTo,
    facts: [
      { label: "Job", value: jobNumber(head.job.number) },
      { label: "Set", value: [head.maker, head.model, head.year ? `(${head.year})` : null].filter(Boolean).join(" ") },
      { label: "Revision", value: `${revision.revision}, ${status}` },
    ],
    lines: priced.lines,
    figures: [...priced.figures, { label: "Deposit to start work", value: money(revision.depositMinor) }],
    notes: [
      "An estimate, not a bill: the work starts once you approve it and the deposit is paid.",
      "If the bench finds more to do, you get a new revision to approve before any extra work.",
    ],
  };
}

/** The job's money documents for a list of links. */
export async function documentsOfJob(jobId: string) {
  const rows = await db
    .select({ id: moneyDocuments.id, kind: moneyDocuments.kind, number: moneyDocuments.number, issuedAt: moneyDocuments.issuedAt })
    .from(moneyDocuments)
    .where(eq(moneyDocuments.jobId, jobId))
    .orderBy(asc(moneyDocuments.issuedAt), sql`${moneyDocuments.number}`);
  return rows;
}

/** The number of the job's newest estimate revision (null before any was sent), for the printable estimate link. */
export async function latestRevisionNumber(jobId: string): Promise<number | null> {
  const [row] = await db
    .select({ revision: estimateRevisions.revision })
    .from(estimateRevisions)
    .where(eq(estimateRevisions.jobId, jobId))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  return row?.revision ?? null;
}
