import { z } from "@/lib/engine/zod";
import { QUEUE_SORTS, type QueueQuery } from "@/lib/engine/jobs/queue-query";
import { JOB_STATES } from "@/lib/engine/jobs/states";
import { setProfileSchema } from "@/lib/engine/checklist/profile";
import { parseFrequencyText } from "@/lib/engine/bands/frequency-text";
import type { ReadingUnit } from "@/lib/engine/verdicts/judge-reading";
import { messageKeySchema } from "@/lib/validation/messages";
import "./field-words";
import { READING_PHASES } from "@/lib/engine/instruments";

// Shared by the bench forms and the bench JSON routes.

export { QUEUE_SORTS, parseJobNumber, type QueueSort } from "@/lib/engine/jobs/queue-query";

export const queueQuerySchema = z.object({
  page: z.coerce.number().int().min(1).max(10_000).default(1),
  pageSize: z.coerce.number().int().min(5).max(100).default(25),
  sort: z.enum(QUEUE_SORTS).default("updatedAt"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  // Comma-separated states; empty means the open ones.
  states: z
    .string()
    .max(400)
    .default("")
    .transform((s) =>
      s
        .split(",")
        .map((x) => x.trim())
        .filter(Boolean),
    )
    .pipe(z.array(z.enum(JOB_STATES, { error: "Unknown state in the filter." }))),
  // "me", "none", a technician's id, or empty for everyone.
  technician: z.string().max(80).default(""),
  q: z.string().trim().max(120).default(""),
  includeClosed: z
    .enum(["0", "1"])
    .default("0")
    .transform((v) => v === "1"),
}) satisfies z.ZodType<QueueQuery, unknown>;
export type { QueueQuery };
export type QueueQueryInput = z.input<typeof queueQuerySchema>;

export const assignSchema = z.object({ technicianId: z.string().min(1).max(80).nullable() });

export const profileUpdateSchema = z.object({
  maker: z.string().trim().min(1, "Maker: give it as printed on the set.").max(80, "Maker: keep it under 80 characters."),
  model: z.string().trim().min(1, "Model: give it as printed on the set.").max(80, "Model: keep it under 80 characters."),
  year: z
    .union(
      [z.literal(""), z.coerce.number({ error: "Year: enter a year from 1900 to 2030, or leave it empty." }).int().min(1900).max(2030)],
      {
        error: "Year: enter a year from 1900 to 2030, or leave it empty.",
      },
    )
    .transform((v) => (v === "" ? null : v))
    .nullable()
    .optional(),
  profile: setProfileSchema,
});
export type ProfileUpdate = z.infer<typeof profileUpdateSchema>;
export type ProfileUpdateInput = z.input<typeof profileUpdateSchema>;

export const questionSchema = z.object({
  question: z
    .string()
    .trim()
    .min(5, "Question: write it for the owner, at least 5 characters.")
    .max(2000, "Question: keep it under 2000 characters."),
  idempotencyKey: messageKeySchema,
});

export const declineSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(5, "Reason: say why the shop cannot take the job, at least 5 characters.")
    .max(1000, "Reason: keep it under 1000 characters."),
});

export const readingInputSchema = z.object({
  key: z.string().min(1).max(60),
  // null clears the reading (it then counts as missing).
  value: z
    .number({ error: "Reading: enter a number, or leave it empty." })
    .finite("Reading: enter a number, or leave it empty.")
    .nullable(),
  note: z.string().trim().max(500, "Note: keep it under 500 characters.").optional(),
  // Without a phase the reading is the one that counts (as returned); the bench sheet always sends one.
  phase: z.enum(READING_PHASES, { error: "Phase: choose as received or as returned." }).optional(),
  // The instrument the reading was taken with (one of the shop's, not retired); null or absent: none named.
  instrumentId: z.uuid({ error: "Instrument: choose one of the shop's instruments." }).nullable().optional(),
});
export type ReadingInput = z.infer<typeof readingInputSchema>;

/**
 * What a technician types into a reading cell: "1,003.5" or "0.21" → a number; "" → null; junk → undefined.
 * Frequencies take a unit and come back in kHz ("1.49 MHz", "455 kHz", "455k"); a bare number is in the
 * row's entry unit (MHz on SW and FM rows). Other readings may carry their own unit ("0.21 mA", "250 V").
 */
export function parseReadingText(text: string, row: { unit: ReadingUnit; entryUnit?: "MHz" } = { unit: "kHz" }): number | null | undefined {
  if (row.unit === "kHz") return parseFrequencyText(text, row.entryUnit ?? "kHz");
  const s = text.trim().replace(/,/g, "");
  if (s === "") return null;
  const m = new RegExp(`^([+-]?(?:\\d+(?:\\.\\d*)?|\\.\\d+))\\s*(?:${row.unit})?$`, "i").exec(s);
  return m ? Number(m[1]) : undefined;
}

export const taskInputSchema = z.object({ code: z.string().min(1).max(80), done: z.boolean() });

export const benchNoteSchema = z.object({
  body: z.string().trim().min(1, "Note: write the note first.").max(4000, "Note: keep it under 4000 characters."),
  idempotencyKey: messageKeySchema,
});

export const returnSchema = z.discriminatedUnion("method", [
  z.object({ method: z.literal("pick-up") }),
  z.object({
    method: z.literal("shipped"),
    carrier: z.string().trim().min(2, "Carrier: name the carrier.").max(60, "Carrier: keep it under 60 characters."),
    trackingNumber: z
      .string()
      .trim()
      .min(4, "Tracking number: enter it, at least 4 characters.")
      .max(60, "Tracking number: keep it under 60 characters.")
      .regex(/^[A-Za-z0-9 -]+$/, "Tracking number: letters, digits, spaces and dashes only."),
  }),
]);
export type ReturnInput = z.infer<typeof returnSchema>;

export const emptySchema = z.object({}).strict();

// The return form keeps both text fields whichever method is picked; it yields a ReturnInput.
export const returnFormSchema = z
  .object({ method: z.enum(["pick-up", "shipped"]), carrier: z.string(), trackingNumber: z.string() })
  .transform((v, ctx): ReturnInput => {
    const parsed = returnSchema.safeParse(v.method === "pick-up" ? { method: "pick-up" } : v);
    if (parsed.success) return parsed.data;
    for (const issue of parsed.error.issues) ctx.addIssue({ code: "custom", path: issue.path, message: issue.message });
    return z.NEVER;
  });
