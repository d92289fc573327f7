import { sql } from "drizzle-orm";
import { boolean, index, integer, jsonb, pgTable, primaryKey, serial, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import type { PostalAddress } from "@/lib/engine/addresses";
import { user } from "./auth";
import { deliveryMethod, intakeChannel, jobState, returnMethod, setKind } from "./enums";

export const radioSets = pgTable(
  "radio_set",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    ownerId: text("owner_id")
      .notNull()
      .references(() => user.id),
    maker: text("maker").notNull(),
    model: text("model").notNull(),
    year: integer("year"),
    serial: text("serial"),
    kind: setKind("kind").notNull(),
    // The set profile that drives the checklist (bands with printed dial ranges, IFs, counts, flags).
    profile: jsonb("profile").$type<Record<string, unknown>>().notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("radio_set_owner_idx").on(t.ownerId)],
);

export const jobs = pgTable(
  "job",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    number: serial("number").notNull().unique(),
    setId: uuid("set_id")
      .notNull()
      .references(() => radioSets.id),
    customerId: text("customer_id")
      .notNull()
      .references(() => user.id),
    technicianId: text("technician_id").references(() => user.id),
    state: jobState("state").notNull().default("requested"),
    symptoms: text("symptoms").notNull().default(""),
    priorWork: text("prior_work").notNull().default(""),
    poweredRecently: text("powered_recently").notNull().default("unknown"),
    delivery: deliveryMethod("delivery").notNull().default("mail-in"),
    contactPreference: text("contact_preference").notNull().default("email"),
    // How the job came in: the owner's own request online, or taken in by staff at the counter or on the phone.
    channel: intakeChannel("channel").notNull().default("online"),
    cautionsAcknowledgedAt: timestamp("cautions_acknowledged_at", { withTimezone: true }),
    // Warranty work: the certificate and claim this job answers.
    certificateId: uuid("certificate_id"),
    claimId: uuid("claim_id"),
    isWarranty: boolean("is_warranty").notNull().default(false),
    returnMethod: returnMethod("return_method"),
    carrier: text("carrier"),
    trackingNumber: text("tracking_number"),
    // Where the owner asked for the set to be shipped back: a copy of the address as chosen, so later edits to
    // the address book do not move a parcel already on its way (lib/server/services/owner-account.ts).
    returnAddress: jsonb("return_address").$type<PostalAddress>(),
    returnAddressChosenAt: timestamp("return_address_chosen_at", { withTimezone: true }),
    receivedAt: timestamp("received_at", { withTimezone: true }),
    completedAt: timestamp("completed_at", { withTimezone: true }),
    returnedAt: timestamp("returned_at", { withTimezone: true }),
    // Set when the owner declines a scope change at the bench and has the set returned as is: the work
    // stops and this (what had been paid) replaces the approved total in the job's account.
    settledTotalMinor: integer("settled_total_minor"),
    // A remainder below the processor's smallest charge, waived by the shop when the balance fell due (the
    // owner could not pay it online): counted in the job's account, with who waived it and when.
    waivedMinor: integer("waived_minor").notNull().default(0),
    waivedBy: text("waived_by").references(() => user.id),
    waivedAt: timestamp("waived_at", { withTimezone: true }),
    version: integer("version").notNull().default(1),
    idempotencyKey: text("idempotency_key"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("job_customer_idx").on(t.customerId),
    index("job_state_idx").on(t.state),
    index("job_technician_idx").on(t.technicianId),
    uniqueIndex("job_idempotency_key_idx")
      .on(t.customerId, t.idempotencyKey)
      .where(sql`${t.idempotencyKey} is not null`),
  ],
);

export const jobStateHistory = pgTable(
  "job_state_history",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    fromState: jobState("from_state"),
    toState: jobState("to_state").notNull(),
    actorId: text("actor_id").references(() => user.id),
    note: text("note"),
    at: timestamp("at", { withTimezone: true })
      .notNull()
      .default(sql`clock_timestamp()`), // several moves in one transaction keep their order
  },
  (t) => [index("job_state_history_job_idx").on(t.jobId, t.at)],
);

export const photos = pgTable(
  "photo",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    uploaderId: text("uploader_id")
      .notNull()
      .references(() => user.id),
    jobId: uuid("job_id").references(() => jobs.id, { onDelete: "cascade" }),
    claimId: uuid("claim_id"),
    // Set when the photo came with a message; such a photo is seen by whoever may read that message.
    messageId: uuid("message_id").references(() => messages.id, { onDelete: "cascade" }),
    storageKey: text("storage_key").notNull().unique(),
    thumbKey: text("thumb_key"),
    url: text("url"),
    thumbUrl: text("thumb_url"),
    displayName: text("display_name").notNull(),
    mime: text("mime").notNull(),
    width: integer("width").notNull(),
    height: integer("height").notNull(),
    bytes: integer("bytes").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("photo_job_idx").on(t.jobId), index("photo_uploader_idx").on(t.uploaderId), index("photo_message_idx").on(t.messageId)],
);

export const messages = pgTable(
  "message",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    authorId: text("author_id")
      .notNull()
      .references(() => user.id),
    body: text("body").notNull(),
    // Staff-only notes never reach the customer.
    internal: boolean("internal").notNull().default(false),
    isQuestion: boolean("is_question").notNull().default(false),
    // Chosen by the author's browser per composed message, so a retried post stores it once. Null on
    // messages the system writes itself (e.g. a decline reason) and on rows from before the column.
    idempotencyKey: text("idempotency_key"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("message_job_idx").on(t.jobId, t.createdAt),
    uniqueIndex("message_idempotency_key_idx")
      .on(t.authorId, t.jobId, t.idempotencyKey)
      .where(sql`${t.idempotencyKey} is not null`),
  ],
);

// How far each person has read a job's thread: messages after this moment are unread for them.
export const messageReads = pgTable(
  "message_read",
  {
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    readUpTo: timestamp("read_up_to", { withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.jobId, t.userId] })],
);

// Checklist lines ticked at the bench (who and when).
export const jobTasks = pgTable(
  "job_task",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id, { onDelete: "cascade" }),
    code: text("code").notNull(),
    title: text("title").notNull(),
    doneBy: text("done_by").references(() => user.id),
    doneAt: timestamp("done_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("job_task_job_code_idx").on(t.jobId, t.code)],
);

export type RadioSet = typeof radioSets.$inferSelect;
export type Job = typeof jobs.$inferSelect;
export type JobStateHistoryRow = typeof jobStateHistory.$inferSelect;
export type Photo = typeof photos.$inferSelect;
export type Message = typeof messages.$inferSelect;
export type MessageRead = typeof messageReads.$inferSelect;
