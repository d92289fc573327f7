import { boolean, doublePrecision, index, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { user } from "./auth";
import { jobs } from "./jobs";

// A job's performance setup: the technician's opt-in, the conditions the readings are taken under and the
// set's service figures. The readings themselves are rows of `reading` under the perf.* keys.
export const jobPerformance = pgTable("job_performance", {
  jobId: uuid("job_id")
    .primaryKey()
    .references(() => jobs.id, { onDelete: "cascade" }),
  enabled: boolean("enabled").notNull().default(false),
  conditions: jsonb("conditions").$type<Record<string, unknown>>().notNull().default({}),
  figures: jsonb("figures").$type<Record<string, number>>().notNull().default({}),
  updatedBy: text("updated_by").references(() => user.id),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

// One IF sweep per strip and kind per job: the response (offset kHz, dB relative) or, for FM, the
// discriminator's DC output (offset kHz, V). Sweeping again replaces it.
export const passbandSweeps = pgTable(
  "passband_sweep",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    ifKHz: doublePrecision("if_khz").notNull(),
    curve: text("curve", { enum: ["response", "discriminator"] }).notNull(),
    method: text("method", { enum: ["sweep", "generator"] }).notNull(),
    points: jsonb("points").$type<Record<string, number>[]>().notNull(),
    /** The discriminator's linearity limit, % of the centre slope; null: the default. */
    linearityPercent: doublePrecision("linearity_percent"),
    recordedBy: text("recorded_by").references(() => user.id),
    recordedAt: timestamp("recorded_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("passband_sweep_job_strip_idx").on(t.jobId, t.ifKHz, t.curve), index("passband_sweep_job_idx").on(t.jobId)],
);

export type JobPerformance = typeof jobPerformance.$inferSelect;
export type PassbandSweep = typeof passbandSweeps.$inferSelect;
