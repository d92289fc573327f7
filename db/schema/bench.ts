import { sql } from "drizzle-orm";
import { boolean, check, doublePrecision, index, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "./auth";
import { verdict } from "./enums";
import { instruments } from "./instruments";
import { jobs } from "./jobs";

// One row per reading key per job and phase (e.g. band.0.edge.low as received, and as returned); re-measuring
// overwrites with a new time.
export const readings = pgTable(
  "reading",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    key: text("key").notNull(),
    value: doublePrecision("value"),
    unit: text("unit").notNull(),
    note: text("note"),
    verdict: verdict("verdict").notNull(),
    toleranceText: text("tolerance_text").notNull().default(""),
    recordedBy: text("recorded_by").references(() => user.id),
    recordedAt: timestamp("recorded_at", { withTimezone: true }).notNull().defaultNow(),
    // Taken when the set came in, or at the end as it goes back; verdicts and the certificate use the latter.
    phase: text("phase").notNull().default("as_returned"),
    instrumentId: uuid("instrument_id").references(() => instruments.id),
    // The instrument's calibration due date had passed on the day of the reading.
    instrumentOverdue: boolean("instrument_overdue").notNull().default(false),
  },
  (t) => [
    uniqueIndex("reading_job_key_phase_idx").on(t.jobId, t.key, t.phase),
    index("reading_job_idx").on(t.jobId),
    index("reading_instrument_idx").on(t.instrumentId),
    check("reading_phase_check", sql`${t.phase} in ('as_received', 'as_returned')`),
  ],
);

export type Reading = typeof readings.$inferSelect;
