import { sql } from "drizzle-orm";
import { check, date, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { INSTRUMENT_KINDS } from "@/lib/engine/instruments";
import { user } from "./auth";

const kindList = sql.raw(INSTRUMENT_KINDS.map((k) => `'${k}'`).join(", "));

// The shop's test instruments. A retired one stays for the history of the readings taken with it; one that
// was ever used is never deleted (the readings reference it).
export const instruments = pgTable(
  "instrument",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    kind: text("kind").notNull(),
    maker: text("maker").notNull(),
    model: text("model").notNull(),
    serial: text("serial").notNull(),
    calibratedOn: date("calibrated_on", { mode: "string" }).notNull(),
    calibrationDueOn: date("calibration_due_on", { mode: "string" }).notNull(),
    retiredAt: timestamp("retired_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    createdBy: text("created_by").references(() => user.id),
  },
  (t) => [
    check("instrument_kind_check", sql`${t.kind} in (${kindList})`),
    check("instrument_due_after_calibration_check", sql`${t.calibrationDueOn} >= ${t.calibratedOn}`),
    uniqueIndex("instrument_identity_idx").on(sql`lower(${t.maker})`, sql`lower(${t.model})`, sql`lower(${t.serial})`),
  ],
);

// Each technician's last instrument per kind, so the bench sheet proposes it on the next reading (kept on
// the server: benches share computers, and a technician moves between the bench PC and a phone).
export const instrumentChoices = pgTable(
  "instrument_choice",
  {
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    instrumentId: uuid("instrument_id")
      .notNull()
      .references(() => instruments.id),
    chosenAt: timestamp("chosen_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.kind] })],
);

export type Instrument = typeof instruments.$inferSelect;
