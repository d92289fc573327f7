import { sql } from "drizzle-orm";
import { boolean, date, index, integer, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "./auth";
import { moneyDocumentKind, paymentMethod, paymentPurpose, paymentStatus, refundKind, refundStatus } from "./enums";
import { estimateRevisions } from "./estimates";
import { jobs } from "./jobs";

export const payments = pgTable(
  "payment",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id),
    revisionId: uuid("revision_id")
      .notNull()
      .references(() => estimateRevisions.id),
    purpose: paymentPurpose("purpose").notNull(),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    status: paymentStatus("status").notNull().default("open"),
    checkoutSessionId: text("checkout_session_id").unique(),
    checkoutUrl: text("checkout_url"),
    paymentIntentId: text("payment_intent_id"),
    idempotencyKey: text("idempotency_key").notNull().unique(),
    refundedMinor: integer("refunded_minor").notNull().default(0),
    // Paid for a checkout that had been superseded (a newer revision, an old amount) or after the job moved
    // on: counted in the account and shown to the office, which refunds it or keeps it against the balance.
    arrivedStale: boolean("arrived_stale").notNull().default(false),
    createdBy: text("created_by").references(() => user.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    paidAt: timestamp("paid_at", { withTimezone: true }),
    /** Card through the processor; cash and cheque are recorded by the office by hand (createdBy). */
    method: paymentMethod("method").notNull().default("card"),
    chequeNumber: text("cheque_number"),
    /** The shop's calendar day the cash or cheque was handed over (YYYY-MM-DD). */
    receivedOn: date("received_on", { mode: "string" }),
    // A manual entry made by mistake is voided, never deleted: it stops counting, and who and why stay.
    voidedBy: text("voided_by").references(() => user.id),
    voidedAt: timestamp("voided_at", { withTimezone: true }),
    voidReason: text("void_reason"),
  },
  (t) => [
    index("payment_job_idx").on(t.jobId),
    // One paid deposit (or balance) per estimate revision, whatever the processor sends. Cash and cheques
    // come in as often as the owner brings them, so the rule holds for card payments only.
    uniqueIndex("payment_one_paid_card_per_revision_idx")
      .on(t.revisionId, t.purpose)
      .where(sql`${t.status} = 'paid' and ${t.method} = 'card'`),
  ],
);

// Every processor event id we acted on; the unique key makes redelivery a no-op.
export const paymentEvents = pgTable("payment_event", {
  id: text("id").primaryKey(),
  type: text("type").notNull(),
  paymentId: uuid("payment_id").references(() => payments.id),
  outcome: text("outcome").notNull(),
  receivedAt: timestamp("received_at", { withTimezone: true }).notNull().defaultNow(),
});

export const refunds = pgTable(
  "refund",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    paymentId: uuid("payment_id")
      .notNull()
      .references(() => payments.id),
    amountMinor: integer("amount_minor").notNull(),
    reason: text("reason").notNull(),
    /** What the money going back means for the account (see refundKind); every earlier refund is a return. */
    kind: refundKind("kind").notNull().default("return"),
    status: refundStatus("status").notNull().default("requested"),
    processorRefundId: text("processor_refund_id").unique(),
    idempotencyKey: text("idempotency_key").notNull().unique(),
    createdBy: text("created_by").references(() => user.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    settledAt: timestamp("settled_at", { withTimezone: true }),
  },
  (t) => [index("refund_payment_idx").on(t.paymentId)],
);

/**
 * The last number given in each document series (a kind and a year). Taken FOR UPDATE in the transaction that
 * issues the document, so a rolled-back payment gives its number back and two at once never share one; a
 * sequence would leave a gap on every rollback.
 */
export const documentCounters = pgTable(
  "document_counter",
  {
    kind: moneyDocumentKind("kind").notNull(),
    year: integer("year").notNull(),
    lastNumber: integer("last_number").notNull().default(0),
  },
  (t) => [primaryKey({ columns: [t.kind, t.year] })],
);

/**
 * A receipt (a payment received), a refund note (a refund settled) or an invoice (the job's final account),
 * issued once with its number and never renumbered. The PDF is drawn from the rows it points at.
 */
export const moneyDocuments = pgTable(
  "money_document",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    kind: moneyDocumentKind("kind").notNull(),
    year: integer("year").notNull(),
    sequence: integer("sequence").notNull(),
    number: text("number").notNull().unique(),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id),
    paymentId: uuid("payment_id").references(() => payments.id),
    refundId: uuid("refund_id").references(() => refunds.id),
    revisionId: uuid("revision_id").references(() => estimateRevisions.id),
    issuedAt: timestamp("issued_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("money_document_series_idx").on(t.kind, t.year, t.sequence),
    uniqueIndex("money_document_payment_idx")
      .on(t.paymentId)
      .where(sql`${t.kind} = 'receipt'`),
    uniqueIndex("money_document_refund_idx")
      .on(t.refundId)
      .where(sql`${t.kind} = 'refund'`),
    uniqueIndex("money_document_invoice_idx")
      .on(t.jobId)
      .where(sql`${t.kind} = 'invoice'`),
    index("money_document_job_idx").on(t.jobId),
  ],
);

export type Payment = typeof payments.$inferSelect;
export type MoneyDocument = typeof moneyDocuments.$inferSelect;
export type Refund = typeof refunds.$inferSelect;
