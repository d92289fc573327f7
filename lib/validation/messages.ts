import { z } from "@/lib/engine/zod";

// The browser picks one key per composed message and keeps it across retries of that message, so a post
// whose answer was lost can be sent again without storing the message twice. A new message gets a new key.
export const messageKeySchema = z
  .string({ error: "Every message needs its idempotency key (a UUID)." })
  .uuid("The idempotency key must be a UUID.");

export const messageBodySchema = z.string().trim().min(1, "Write a message first.").max(4000, "Keep the message under 4000 characters.");

/** Photos one message may carry. */
export const MAX_MESSAGE_PHOTOS = 4;

/** The signed tickets the upload answered with, one per photo, attached when the message is posted. */
export const messagePhotosSchema = z
  .array(z.string().min(1, "A photo could not be matched to your upload. Please add it again.").max(4000), {
    error: "Photos must be a list of uploaded photos.",
  })
  .max(MAX_MESSAGE_PHOTOS, `At most ${MAX_MESSAGE_PHOTOS} photos per message.`)
  .optional()
  .default([]);

/** What the message forms edit. */
export const messageFormSchema = z.object({ body: messageBodySchema });

/** POST /api/portal/jobs/:id/messages and POST /api/bench/jobs/:id/messages */
export const messageSchema = messageFormSchema.extend({ idempotencyKey: messageKeySchema, photos: messagePhotosSchema });

/** POST …/messages/read: the newest message the reader has seen on the page. */
export const messageReadSchema = z.object({ lastMessageId: z.string().uuid("Name the newest message you have seen by its id.") });

export type MessageForm = z.infer<typeof messageFormSchema>;
export type MessageInput = z.infer<typeof messageSchema>;
