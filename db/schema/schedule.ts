import { jsonb, pgTable, text, timestamp } from "drizzle-orm/pg-core";
import { user } from "./auth";

// Each staff member's bench time: minutes per weekday (Monday first) and calendar days off, set by the office.
// The turnaround forecast reads it; a technician without a row counts the engine's assumed week.
export const benchWeeks = pgTable("bench_week", {
  userId: text("user_id")
    .primaryKey()
    .references(() => user.id, { onDelete: "cascade" }),
  minutes: jsonb("minutes").$type<number[]>().notNull(),
  daysOff: jsonb("days_off").$type<string[]>().notNull().default([]),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  updatedBy: text("updated_by").references(() => user.id),
});

export type BenchWeekRow = typeof benchWeeks.$inferSelect;
