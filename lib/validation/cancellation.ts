import { z } from "@/lib/engine/zod";

// Calling a job off before the bench: the owner withdrawing a request, the shop cancelling a job.

export const withdrawSchema = z.object({
  reason: z
    .string()
    .trim()
    .max(1000, "Keep it under 1000 characters.")
    .optional()
    .transform((v) => (v ? v : null)),
});
export type WithdrawInput = z.input<typeof withdrawSchema>;

export const cancelJobSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(5, "Say why the shop is cancelling (at least 5 characters); the owner reads it.")
    .max(1000, "Keep it under 1000 characters."),
  /** Refund what is owed back straight away (the default), or only show it as owed back. */
  refund: z.boolean().default(true),
});
export type CancelJobInput = z.input<typeof cancelJobSchema>;
