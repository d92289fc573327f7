import { index, integer, pgTable, text, timestamp } from "drizzle-orm/pg-core";
import { user } from "./auth";

// Every photo kept in the upload store, from the moment the upload is acknowledged: the daily quota counts
// these rows, and a row no `photo` refers to after a day is an abandoned upload the sweep removes.
export const storedUploads = pgTable(
  "stored_upload",
  {
    key: text("key").primaryKey(),
    thumbKey: text("thumb_key"),
    uploaderId: text("uploader_id")
      .notNull()
      .references(() => user.id),
    bytes: integer("bytes").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("stored_upload_uploader_idx").on(t.uploaderId, t.createdAt), index("stored_upload_created_idx").on(t.createdAt)],
);
