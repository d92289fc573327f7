import { sql } from "drizzle-orm";
import { index, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "./auth";
import { claimStatus } from "./enums";
import { jobs } from "./jobs";

// Immutable once issued: a correction is a new row that supersedes this one.
export const certificates = pgTable(
  "certificate",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    code: text("code").notNull().unique(),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id),
    customerId: text("customer_id")
      .notNull()
      .references(() => user.id),
    content: jsonb("content").$type<Record<string, unknown>>().notNull(),
    signature: text("signature").notNull(),
    keyId: text("key_id").notNull(),
    issuedAt: timestamp("issued_at", { withTimezone: true }).notNull().defaultNow(),
    termEndsAt: timestamp("term_ends_at", { withTimezone: true }).notNull(),
    supersedesId: uuid("supersedes_id"),
    supersededById: uuid("superseded_by_id"),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
    revokedBy: text("revoked_by").references(() => user.id),
    revokeReason: text("revoke_reason"),
  },
  (t) => [index("certificate_job_idx").on(t.jobId), index("certificate_customer_idx").on(t.customerId)],
);

export const claims = pgTable(
  "claim",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    certificateId: uuid("certificate_id")
      .notNull()
      .references(() => certificates.id),
    claimantId: text("claimant_id")
      .notNull()
      .references(() => user.id),
    symptomCategory: text("symptom_category").notNull(),
    description: text("description").notNull(),
    advice: jsonb("advice").$type<Record<string, unknown>>().notNull(),
    status: claimStatus("status").notNull().default("open"),
    decisionReason: text("decision_reason"),
    decidedBy: text("decided_by").references(() => user.id),
    decidedAt: timestamp("decided_at", { withTimezone: true }),
    warrantyJobId: uuid("warranty_job_id").references(() => jobs.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("claim_certificate_idx").on(t.certificateId),
    // One open claim per certificate at a time, even under concurrent submissions.
    uniqueIndex("claim_one_open_per_certificate_idx")
      .on(t.certificateId)
      .where(sql`${t.status} in ('open', 'inspecting')`),
  ],
);

export type Certificate = typeof certificates.$inferSelect;
export type Claim = typeof claims.$inferSelect;
