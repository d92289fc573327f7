import { sql } from "drizzle-orm";
import { boolean, index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "./auth";
import { paymentPurpose, paymentStatus, refundStatus } from "./enums";
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
  },
  (t) => [
    index("payment_job_idx").on(t.jobId),
    // One paid deposit (or balance) per estimate revision, whatever the processor sends.
    uniqueIndex("payment_one_paid_per_revision_idx")
      .on(t.revisionId, t.purpose)
      .where(sql`${t.status} = 'paid'`),
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
    status: refundStatus("status").notNull().default("requested"),
    processorRefundId: text("processor_refund_id").unique(),
    idempotencyKey: text("idempotency_key").notNull().unique(),
    createdBy: text("created_by").references(() => user.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    settledAt: timestamp("settled_at", { withTimezone: true }),
  },
  (t) => [index("refund_payment_idx").on(t.paymentId)],
);

export type Payment = typeof payments.$inferSelect;
export type Refund = typeof refunds.$inferSelect;
