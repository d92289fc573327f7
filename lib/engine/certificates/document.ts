import { z } from "../zod";
import { dayInZone } from "../dates";
import { describeTerm } from "../warranty/term";
import { INSTRUMENT_KINDS } from "../instruments";
import { certificateContentSchema } from "./content";
import { passbandSectionSchema, performanceSectionSchema } from "./performance-section";

// The written warranty as carried in the signed content, and the signed document itself. The schema here is
// the certificate's own and stays stable: stored certificates must parse forever, whatever the settings
// form becomes.

/** The shop's contact block as the warranty text prints it. */
export type WarrantorContact = { name: string; addressLines: string[]; phone: string; email: string };

/** Printed on every certificate: the warranty gives rights that local law may add to. */
export const RIGHTS_SENTENCE =
  "This warranty gives you specific legal rights, and you may also have other rights which vary from state to state. Nothing in it limits the rights the law where you live gives you.";

export const certificateTermsSchema = z.object({
  /** Coverage passes to a later owner of the set for the rest of the term. */
  transferable: z.boolean(),
  whoIsCovered: z.string(),
  whatWeWillDo: z.string(),
  whatWeWillNotDo: z.string(),
  howToClaim: z.array(z.string()),
  disputes: z.string(),
  impliedWarranties: z.string(),
  consequentialDamages: z.string(),
  shopWording: z.string(),
  rightsSentence: z.string(),
});
export type CertificateTerms = z.infer<typeof certificateTermsSchema>;

/** The whole written warranty as plain text (the engine's termsText), in the order a reader needs it. */
export function composeTermsText(
  terms: CertificateTerms,
  warranty: {
    designation: "limited" | "full";
    termDays: number;
    startsOn: string;
    endsOn: string;
    covered?: readonly { text: string }[];
    excluded?: readonly { text: string }[];
  },
  shop: WarrantorContact,
  returnedOn: string = warranty.startsOn,
): string {
  const title = `${warranty.designation === "full" ? "Full" : "Limited"} ${warranty.termDays}-day warranty`;
  const contact = [shop.name, ...shop.addressLines, shop.phone, shop.email].filter((x) => x.trim().length > 0).join(", ");
  return [
    title,
    `Who is covered: ${terms.whoIsCovered}`,
    terms.transferable
      ? "If the set changes hands during the term, the new owner is covered for the rest of the term."
      : "The coverage does not pass to a later owner of the set.",
    `Term: ${describeTerm(warranty, returnedOn)}`,
    ...(warranty.covered?.length ? ["What is covered:", ...warranty.covered.map((c) => `- ${c.text}`)] : []),
    `What we will do: ${terms.whatWeWillDo}`,
    // The exclusions follow the sentence that points to them ("the exclusions below"), as on the PDF.
    `What we will not do: ${terms.whatWeWillNotDo}`,
    ...(warranty.excluded?.length ? ["What is not covered:", ...warranty.excluded.map((e) => `- ${e.text}`)] : []),
    "How to make a claim:",
    ...terms.howToClaim.map((step, i) => `${i + 1}. ${step}`),
    `Warrantor: ${contact}`,
    `Disputes: ${terms.disputes}`,
    terms.impliedWarranties,
    terms.consequentialDamages,
    ...(terms.shopWording ? [terms.shopWording] : []),
    terms.rightsSentence,
  ].join("\n");
}

// The signed document: the engine's content plus the written-warranty wording and, for a correction,
// which certificate it replaces. Every field is covered by the signature.

// Instruments and phases. Certificates issued before the register carry none of these fields and keep the
// exact content they were signed with; a job with no instrument named and no as-received reading leaves them
// out too. `instrument` is a reference into `instruments` (I1, I2, ...); `instrumentOverdue` is present only
// when the instrument's calibration due date had passed on the day of the reading.
const contentReadingSchema = certificateContentSchema.shape.readings.element;

export const certificateInstrumentSchema = z.object({
  ref: z.string(),
  kind: z.enum(INSTRUMENT_KINDS),
  maker: z.string(),
  model: z.string(),
  serial: z.string(),
  calibratedOn: z.string(),
  calibrationDueOn: z.string(),
});
export type CertificateInstrument = z.infer<typeof certificateInstrumentSchema>;

const takenWith = { instrument: z.string().optional(), instrumentOverdue: z.literal(true).optional() };

export const certificateReadingSchema = contentReadingSchema.extend({
  ...takenWith,
  /** The same reading as the set came in, where one was taken; the verdict is as judged at the bench. */
  asReceived: z.object({ value: z.number().nullable(), verdict: contentReadingSchema.shape.verdict, ...takenWith }).optional(),
});

export const certificateDocumentSchema = certificateContentSchema.extend({
  /** As returned: the figures the verdicts and band edges come from. */
  readings: z.array(certificateReadingSchema),
  /** The instruments the readings were taken with, with their calibration dates on the day of issue. */
  instruments: z.array(certificateInstrumentSchema).optional(),
  terms: certificateTermsSchema,
  correction: z.object({ supersedesCode: z.string(), reason: z.string() }).optional(),
  // Warranty work: the certificate and the claim this job answers. The work and parts listed are the new
  // work done under the claim, and the term runs afresh for them.
  answers: z.object({ certificateCode: z.string(), claimId: z.string(), claimOpenedOn: z.string() }).optional(),
  // Receiver performance and the IF passband, only when the job measured them: certificates without them
  // parse and verify exactly as they did.
  performance: performanceSectionSchema.optional(),
  passband: passbandSectionSchema.optional(),
});
export type CertificateDocument = z.infer<typeof certificateDocumentSchema>;
export type CertificateReading = z.infer<typeof certificateReadingSchema>;

export function parseCertificateDocument(content: unknown): CertificateDocument | null {
  const parsed = certificateDocumentSchema.safeParse(content);
  return parsed.success ? parsed.data : null;
}

export type CertificateStatus = "valid" | "expired" | "revoked" | "superseded" | "unverifiable";

/** Today's calendar day in the shop's zone (UTC when none is given), as "YYYY-MM-DD". */
export function todayIso(now = new Date(), timeZone = "UTC"): string {
  return dayInZone(now, timeZone);
}

/** "AU-52-1187" → "AU••••87": enough for a buyer to match the set in front of them, not its length or the rest. */
export function maskSerial(serial: string | undefined): string | null {
  if (!serial) return null;
  const s = serial.trim();
  if (s.length <= 4) return "••••";
  const keep = s.length <= 6 ? 1 : 2;
  return `${s.slice(0, keep)}••••${s.slice(-keep)}`;
}
