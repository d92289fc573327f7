import { index, integer, jsonb, pgTable, text, timestamp, unique, uuid } from "drizzle-orm/pg-core";
import { user } from "./auth";
import { decisionMedium, lineCategory, revisionStatus } from "./enums";
import { jobs } from "./jobs";
import { parts } from "./parts";

// The working estimate of a job; `version` guards concurrent edits (409 on a stale save).
export const estimates = pgTable("estimate", {
  id: uuid("id").primaryKey().defaultRandom(),
  jobId: uuid("job_id")
    .notNull()
    .unique()
    .references(() => jobs.id, { onDelete: "cascade" }),
  draft: jsonb("draft").$type<Record<string, unknown>>().notNull(),
  currentRevision: integer("current_revision").notNull().default(0),
  version: integer("version").notNull().default(1),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  updatedBy: text("updated_by").references(() => user.id),
});

// A revision is what the owner saw and approves; it is never edited once sent.
export const estimateRevisions = pgTable(
  "estimate_revision",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    estimateId: uuid("estimate_id")
      .notNull()
      .references(() => estimates.id, { onDelete: "cascade" }),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    revision: integer("revision").notNull(),
    status: revisionStatus("status").notNull().default("sent"),
    currency: text("currency").notNull(),
    labourMinor: integer("labour_minor").notNull(),
    partsMinor: integer("parts_minor").notNull(),
    taxMinor: integer("tax_minor").notNull(),
    totalMinor: integer("total_minor").notNull(),
    depositMinor: integer("deposit_minor").notNull(),
    // Figures and wording as priced at send time (tax rates, warranty summary).
    pricing: jsonb("pricing").$type<Record<string, unknown>>().notNull(),
    changeSummary: text("change_summary"),
    sentBy: text("sent_by").references(() => user.id),
    sentAt: timestamp("sent_at", { withTimezone: true }).notNull().defaultNow(),
    decidedBy: text("decided_by").references(() => user.id),
    decidedAt: timestamp("decided_at", { withTimezone: true }),
    declineReason: text("decline_reason"),
    // A decision the owner gave in person, by phone or in writing and staff recorded for them: who typed it in,
    // how it was given and what was said. `decided_by` stays the owner whose decision it is.
    decisionRecordedBy: text("decision_recorded_by").references(() => user.id),
    decisionMedium: decisionMedium("decision_medium"),
    decisionNote: text("decision_note"),
  },
  (t) => [unique("estimate_revision_job_rev_uq").on(t.jobId, t.revision), index("estimate_revision_job_idx").on(t.jobId)],
);

export const estimateLines = pgTable(
  "estimate_line",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    revisionId: uuid("revision_id")
      .notNull()
      .references(() => estimateRevisions.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
    code: text("code").notNull(),
    title: text("title").notNull(),
    category: lineCategory("category").notNull(),
    minutes: integer("minutes").notNull().default(0),
    quantity: integer("quantity").notNull().default(1),
    reason: text("reason").notNull().default(""),
    readings: jsonb("readings").$type<string[]>().notNull().default([]),
    // Parts: cost is staff-only; the customer sees the price.
    partCostMinor: integer("part_cost_minor"),
    markupBp: integer("markup_bp"),
    // The catalogue part a part line was priced from, when it came from the catalogue (stock, history).
    partId: uuid("part_id").references(() => parts.id),
    labourMinor: integer("labour_minor").notNull().default(0),
    partsMinor: integer("parts_minor").notNull().default(0),
    coveredByWarranty: integer("covered_by_warranty").notNull().default(0),
  },
  (t) => [unique("estimate_line_rev_pos_uq").on(t.revisionId, t.position)],
);

export type Estimate = typeof estimates.$inferSelect;
export type EstimateRevision = typeof estimateRevisions.$inferSelect;
export type EstimateLine = typeof estimateLines.$inferSelect;
