import { sql } from "drizzle-orm";
import { check, index, integer, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "./auth";
import { jobs } from "./jobs";

// The shop's parts catalogue. `code` is set only on the parts the checklist rules call for (the part
// lines the estimate builds by itself look them up by it); parts the shop adds have none. A part that an
// estimate used is retired, never deleted: sent revisions keep their own cost and markup on their lines.
export const parts = pgTable(
  "part",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    code: text("code"),
    name: text("name").notNull(),
    supplierRef: text("supplier_ref"),
    /** In the shop currency's minor units. */
    costMinor: integer("cost_minor").notNull(),
    /** Basis points; null: the shop's default markup applies. */
    markupBp: integer("markup_bp"),
    /** Null: the shop does not count this part. May fall below zero when approvals take more than counted. */
    stock: integer("stock"),
    retiredAt: timestamp("retired_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    createdBy: text("created_by").references(() => user.id),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    updatedBy: text("updated_by").references(() => user.id),
  },
  (t) => [
    uniqueIndex("part_code_idx").on(t.code),
    check("part_cost_check", sql`${t.costMinor} >= 0`),
    check("part_markup_check", sql`${t.markupBp} is null or ${t.markupBp} >= 0`),
  ],
);

// What an approved estimate took from stock for a job, per part: approving a later revision takes or
// gives back only the difference, and cancelling the job before the bench gives it all back.
export const partStockTakes = pgTable(
  "part_stock_take",
  {
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    partId: uuid("part_id")
      .notNull()
      .references(() => parts.id),
    quantity: integer("quantity").notNull(),
  },
  (t) => [primaryKey({ columns: [t.jobId, t.partId] }), index("part_stock_take_part_idx").on(t.partId)],
);

export type Part = typeof parts.$inferSelect;
