import { sql } from "drizzle-orm";
import { boolean, index, pgEnum, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { NOTIFICATION_KINDS } from "@/lib/engine/notifications";
import { user } from "./auth";
import { jobs } from "./jobs";
import { claims } from "./warranty";

export const notificationKind = pgEnum("notification_kind", NOTIFICATION_KINDS);

// One row per person told of an event in the app, written in the transaction of the event itself.
export const notifications = pgTable(
  "notification",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    recipientId: text("recipient_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    kind: notificationKind("kind").notNull(),
    // What happened, said once for the list and the e-mail; never a workshop note.
    title: text("title").notNull(),
    body: text("body").notNull().default(""),
    jobId: uuid("job_id").references(() => jobs.id, { onDelete: "cascade" }),
    claimId: uuid("claim_id").references(() => claims.id, { onDelete: "cascade" }),
    actorId: text("actor_id").references(() => user.id, { onDelete: "set null" }),
    // The event's own identity (a message id, a payment id): a redelivered event finds its row and stops.
    dedupeKey: text("dedupe_key").notNull(),
    readAt: timestamp("read_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("notification_recipient_dedupe_idx").on(t.recipientId, t.dedupeKey),
    index("notification_recipient_created_idx").on(t.recipientId, t.createdAt),
    index("notification_unread_idx")
      .on(t.recipientId)
      .where(sql`${t.readAt} is null`),
  ],
);

// A person's choice per kind of event; a kind with no row keeps DEFAULT_NOTIFICATION_PREFERENCES.
export const notificationPreferences = pgTable(
  "notification_preference",
  {
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    kind: notificationKind("kind").notNull(),
    inApp: boolean("in_app").notNull(),
    email: boolean("email").notNull(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.kind] })],
);

export type Notification = typeof notifications.$inferSelect;
