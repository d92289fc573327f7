import { doublePrecision, index, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "./auth";
import { verdict } from "./enums";
import { jobs } from "./jobs";

// One row per reading key per job (e.g. band.0.edge.low); re-measuring overwrites with a new time.
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
  },
  (t) => [uniqueIndex("reading_job_key_idx").on(t.jobId, t.key), index("reading_job_idx").on(t.jobId)],
);

export type Reading = typeof readings.$inferSelect;
