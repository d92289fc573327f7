import { z } from "@/lib/engine/zod";
import { INTAKE_CHANNELS } from "@/lib/engine/contacts";
import "./field-words";
import { CONTACT, MAX_PHOTOS, PHONE_PATTERN, setProfileShape } from "./quote";

// Counter and phone intake: the customer (found or added), the set profile exactly as the online request
// checks it, the channel and the counter's photos. Shared by the intake page and the server.

export const CUSTOMER_MODES = ["existing", "new"] as const;
export const NEW_CUSTOMER_ACCESS = ["invite", "contact"] as const;

const text = (max: number, message: string) => z.string().trim().max(max, message).optional().default("");

export const customerSearchSchema = z.object({
  q: z
    .string()
    .trim()
    .min(2, "Search: type at least 2 characters of a name, e-mail or phone number.")
    .max(120, "Search: keep it under 120 characters."),
});

export const intakeSchema = z
  .object({
    customerMode: z.enum(CUSTOMER_MODES, { error: "Customer: choose an existing customer or add a new one." }),
    customerId: text(64, "Customer: choose one from the search results."),
    customerName: text(120, "Customer's name: keep it under 120 characters."),
    customerEmail: z.string().trim().toLowerCase().max(254, "Customer's e-mail: keep it under 254 characters.").optional().default(""),
    customerPhone: text(40, "Customer's phone: keep it under 40 characters."),
    access: z.enum(NEW_CUSTOMER_ACCESS, { error: "Sign-in: choose to invite the customer or keep them as a contact." }).default("contact"),
    ...setProfileShape,
    channel: z.enum(INTAKE_CHANNELS, { error: "Came in: choose at the counter or by phone." }),
    // At the counter the set is normally handed over there and then; the box is left unticked when it is not.
    setAtShop: z.boolean({ error: "Set at the shop: tick or untick the box." }).default(false),
    contactPreference: z.enum(CONTACT, { error: "Reaching the customer: choose e-mail or phone." }),
    cautionsGiven: z.literal(true, { error: "Cautions: tell the customer the cautions, then tick the box." }),
    photos: z.array(z.string().min(1).max(4000)).max(MAX_PHOTOS, `Photos: ${MAX_PHOTOS} at most per job.`).default([]),
    idempotencyKey: z.string().uuid({ error: "Form key: reload the page and fill the form in again." }),
  })
  .superRefine((v, ctx) => {
    const issue = (path: string, message: string) => ctx.addIssue({ code: "custom", path: [path], message });
    if (v.customerMode === "existing") {
      if (!v.customerId) issue("customerId", "Customer: choose one from the search results, or add a new customer.");
    } else {
      if (!v.customerName) issue("customerName", "Customer's name: enter the name the customer gives.");
      const email = v.customerEmail;
      if (email && !z.email().safeParse(email).success)
        issue("customerEmail", "Customer's e-mail: enter a valid address, or leave it empty.");
      if (v.customerPhone && !PHONE_PATTERN.test(v.customerPhone))
        issue("customerPhone", "Customer's phone: digits, spaces and + ( ) . - only, 6 to 40 characters.");
      if (!email && !v.customerPhone)
        issue("customerEmail", "Customer's e-mail: give an e-mail or a phone number, so the shop can reach them.");
      if (v.access === "invite" && !email) issue("customerEmail", "Customer's e-mail: an invitation needs an e-mail address to go to.");
      if (v.contactPreference === "email" && !email)
        issue("contactPreference", "Reaching the customer: without an e-mail address, choose phone.");
      if (v.contactPreference === "phone" && !v.customerPhone)
        issue("customerPhone", "Customer's phone: give a number to call, or choose e-mail.");
    }
    if (v.channel === "phone" && v.setAtShop) issue("setAtShop", "Set at the shop: a set taken in by phone is not at the shop yet.");
  });

export type IntakeInput = z.input<typeof intakeSchema>;
export type Intake = z.infer<typeof intakeSchema>;

export const recordDecisionSchema = z
  .object({
    revisionId: z.string().uuid({ error: "Estimate: reload the job and choose the revision again." }),
    decision: z.enum(["approve", "decline"], { error: "Decision: choose approved or declined." }),
    medium: z.enum(["in-person", "phone", "letter"], { error: "How it was given: choose in person, by phone or in writing." }),
    note: z
      .string()
      .trim()
      .min(3, "What the owner said: write a few words, at least 3 characters (who you spoke to, what they agreed).")
      .max(2000, "What the owner said: keep it under 2000 characters."),
    afterDecline: z
      .enum(["approved-scope", "return-as-is"], {
        message: 'What happens next: choose "carry on with the work approved before" or "return the set as it is".',
      })
      .optional(),
  })
  .strict();
export type RecordDecision = z.infer<typeof recordDecisionSchema>;
