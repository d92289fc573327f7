import { z } from "zod";

// The browser picks one key per composed message and keeps it across retries of that message, so a post
// whose answer was lost can be sent again without storing the message twice. A new message gets a new key.
export const messageKeySchema = z
  .string({ error: "Every message needs its idempotency key (a UUID)." })
  .uuid("The idempotency key must be a UUID.");

export const messageBodySchema = z.string().trim().min(1, "Write a message first.").max(4000, "Keep the message under 4000 characters.");

/** What the owner's message form edits. */
export const messageFormSchema = z.object({ body: messageBodySchema });

/** POST /api/portal/jobs/:id/messages */
export const messageSchema = messageFormSchema.extend({ idempotencyKey: messageKeySchema });

export type MessageForm = z.infer<typeof messageFormSchema>;
export type MessageInput = z.infer<typeof messageSchema>;
