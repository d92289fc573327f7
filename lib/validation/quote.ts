import { z } from "@/lib/engine/zod";
import "./field-words";

// The quote request, shared by the form (react-hook-form + zod resolver) and the server.

export const MAX_PHOTOS = 12;
export const MAX_PHOTO_BYTES = 16 * 1024 * 1024;
export const SET_KINDS = ["tube-acdc", "tube-transformer", "transistor-battery", "transistor-mains"] as const;
export const DIAL_BANDS = ["LW", "MW", "SW", "FM"] as const;
export const POWERED_RECENTLY = ["no", "briefly", "yes", "unknown"] as const;
export const DELIVERY = ["mail-in", "drop-off"] as const;
export const CONTACT = ["email", "phone"] as const;
/** A number someone can call: digits, spaces and + ( ) . -; shared by the quote request and the account page. */
export const PHONE_PATTERN = /^[+()\d\s.-]{6,40}$/;
export const PHONE_NEEDED_MESSAGE = "Phone number: give one we can call (digits, spaces, + ( ) . -), or choose e-mail.";

export const SET_KIND_HELP: Record<(typeof SET_KINDS)[number], { label: string; hint: string }> = {
  "tube-acdc": {
    label: "Tube set without a mains transformer (AC/DC)",
    hint: "Small table sets, often five tubes; the chassis can be live.",
  },
  "tube-transformer": { label: "Tube set with a mains transformer", hint: "Heavier sets and consoles; a transformer sits on the chassis." },
  "transistor-battery": { label: "Transistor set on batteries", hint: "Portables and pocket sets." },
  "transistor-mains": { label: "Transistor set on mains power", hint: "Plugs into the wall, sometimes with batteries too." },
};

export const BAND_LABEL: Record<(typeof DIAL_BANDS)[number], string> = {
  LW: "Long wave (LW)",
  MW: "Medium wave / AM broadcast (MW)",
  SW: "Short wave (SW)",
  FM: "FM",
};

export const POWERED_LABEL: Record<(typeof POWERED_RECENTLY)[number], string> = {
  no: "No, it has not been plugged in",
  briefly: "Briefly, to see if it works",
  yes: "Yes, it has been used recently",
  unknown: "I don't know",
};

export const CAUTIONS = [
  "Please do not plug in or switch on a set that has not been restored: old capacitors and worn cords can overheat, catch fire or give a shock.",
  "AC/DC sets (tube sets without a mains transformer) can have a live chassis: never touch the chassis or the back of an opened set while it is plugged in.",
  "Remove all batteries from portables before shipping; leaking cells damage the set.",
  "Work on mains wiring follows your local electrical codes; leave it to licensed, qualified people.",
] as const;

const optionalText = (max: number, message: string) => z.string().trim().max(max, message).optional().default("");

const yearSchema = z.preprocess(
  (v) => (v === "" || v === null || v === undefined ? undefined : v),
  z.coerce
    .number({ error: `Year: enter a year from 1900 to ${new Date().getFullYear()} as four digits, or leave it empty.` })
    .int()
    .min(1900)
    .max(new Date().getFullYear())
    .optional(),
);

const DIAL_NUMBER_MESSAGE = "Dial scale ends: write the number as printed on the dial, for example 55 or 5.9, or leave it empty.";
const dialNumber = z.preprocess(
  (v) => (v === "" || v === null || v === undefined ? undefined : typeof v === "string" ? v.trim().replace(",", ".") : v),
  z.coerce.number({ error: DIAL_NUMBER_MESSAGE }).positive(DIAL_NUMBER_MESSAGE).max(100_000, DIAL_NUMBER_MESSAGE).optional(),
);

/** The lowest and highest number printed at the ends of one band's dial scale, as the owner reads them. */
export const dialEndsSchema = z.object({ low: dialNumber, high: dialNumber }).superRefine((v, ctx) => {
  if (v.low !== undefined && v.high !== undefined && v.high <= v.low) {
    ctx.addIssue({ code: "custom", path: ["high"], message: "Dial scale ends: the highest number must be above the lowest one." });
  }
});

export type DialEnds = z.infer<typeof dialEndsSchema>;

/** The set and what is wrong with it: the same fields, checked the same way, online and at the counter. */
export const setProfileShape = {
  maker: z.string().trim().min(1, "Maker: write it as printed on the set.").max(80, "Maker: keep it under 80 characters."),
  model: z
    .string()
    .trim()
    .min(1, "Model: write it as printed, e.g. on the back or the label.")
    .max(80, "Model: keep it under 80 characters."),
  year: yearSchema,
  serial: optionalText(60, "Serial number: keep it under 60 characters."),
  kind: z.enum(SET_KINDS, { error: "Kind of set: choose one of the kinds listed." }),
  bands: z
    .array(z.enum(DIAL_BANDS, { error: "Bands: tick from the bands listed." }))
    .min(1, "Bands: tick at least one band printed on the dial.")
    .max(4, "Bands: four at most."),
  dialMarkings: optionalText(300, "Dial numbers: keep them under 300 characters."),
  // Per band ticked above; ends of bands not ticked are dropped when the request is stored.
  dialEnds: z
    .object({
      LW: dialEndsSchema.optional(),
      MW: dialEndsSchema.optional(),
      SW: dialEndsSchema.optional(),
      FM: dialEndsSchema.optional(),
    })
    .optional()
    .default({}),
  symptoms: z
    .string()
    .trim()
    .min(10, "What it does: tell us in a sentence or two what is wrong, at least 10 characters.")
    .max(4000, "What it does: keep it under 4000 characters."),
  priorWork: optionalText(4000, "Earlier work: keep it under 4000 characters."),
  poweredRecently: z.enum(POWERED_RECENTLY, { error: "Powered recently: choose one of the answers." }),
};

export const quoteRequestSchema = z
  .object({
    ...setProfileShape,
    delivery: z.enum(DELIVERY, { error: "Getting the set to us: choose mail-in or drop-off." }),
    contactPreference: z.enum(CONTACT, { error: "Reaching you: choose e-mail or phone." }),
    phone: optionalText(40, "Phone number: keep it under 40 characters."),
    cautionsAcknowledged: z.literal(true, { error: "Cautions: please read them and tick the box." }),
    photos: z
      .array(z.string().min(1).max(4000))
      .min(1, "Photos: add at least one photo of the set.")
      .max(MAX_PHOTOS, `Photos: ${MAX_PHOTOS} at most per request.`),
    idempotencyKey: z.string().uuid(),
  })
  .superRefine((v, ctx) => {
    if (v.contactPreference === "phone" && !PHONE_PATTERN.test(v.phone)) {
      ctx.addIssue({ code: "custom", path: ["phone"], message: PHONE_NEEDED_MESSAGE });
    }
  });

export type QuoteRequestInput = z.input<typeof quoteRequestSchema>;
export type QuoteRequest = z.infer<typeof quoteRequestSchema>;

export const approveSchema = z.object({ revisionId: z.string().uuid() });
export const declineSchema = z.object({
  revisionId: z.string().uuid(),
  reason: z
    .string()
    .trim()
    .min(3, "Reason: tell the shop briefly why, so they can help.")
    .max(2000, "Reason: keep it under 2000 characters."),
  // Only for a change asked while the set is on the bench: go on with the scope approved before, or stop
  // the work and have the set returned as it is.
  afterDecline: z
    .enum(["approved-scope", "return-as-is"], {
      message: 'What happens next: choose "carry on with the work I approved before" or "return my set as it is".',
    })
    .optional(),
});
export const checkoutSchema = z.object({ jobId: z.string().uuid(), purpose: z.enum(["deposit", "balance"]) });
