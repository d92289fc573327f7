import { z } from "@/lib/engine/zod";
import "./field-words";
import { claimSymptoms, exclusionCodes, type ClaimSymptom, type ExclusionCode } from "@/lib/engine/warranty";

/** What the owner may say happened since the set came back (each is an exclusion the shop can name). */
export const ownerStatementCodes = [
  "excl.physical-damage",
  "excl.opened-by-others",
  "excl.battery-leakage",
  "excl.wrong-supply",
] as const satisfies readonly ExclusionCode[];
export const ownerStatementSchema = z.enum(ownerStatementCodes);

export const OWNER_STATEMENT_LABEL: Record<(typeof ownerStatementCodes)[number], string> = {
  "excl.physical-damage": "It was dropped, knocked, got wet or was near heat",
  "excl.opened-by-others": "Someone other than the shop opened it or worked on it",
  "excl.battery-leakage": "Batteries were left in it and leaked",
  "excl.wrong-supply": "It was connected to a different supply, battery or adapter",
};

export const SYMPTOM_LABEL: Record<ClaimSymptom, string> = {
  "no-power": "No power: no lights, no warm-up",
  "no-sound": "Lights up but no sound",
  hum: "Hum or buzz",
  "weak-reception": "Weak reception, few stations",
  "dial-off-calibration": "Stations are not where the dial says",
  "dial-cord": "Dial pointer does not move or slips",
  intermittent: "Cuts in and out",
  "noisy-controls": "Crackle when turning the knobs",
  "shock-or-tingle": "Tingle or shock from the cabinet, knobs or metal",
  "smoke-or-smell": "Smoke, burning smell or a part got hot",
  "wear-item": "A tube, dial lamp or battery gave out",
  cosmetic: "Cabinet, finish, knobs or dial glass",
  other: "Something else",
};

export const SYMPTOM_OPTIONS = claimSymptoms.map((value) => ({ value, label: SYMPTOM_LABEL[value] }));

export const MAX_CLAIM_PHOTOS = 12;

const description = z
  .string({ error: "The fault: describe what happens." })
  .trim()
  .min(10, "The fault: tell us a little more, at least 10 characters.")
  .max(4000, "The fault: keep it under 4000 characters.");

const claimFields = {
  symptomCategory: z.enum(claimSymptoms, { error: "What the set does: choose one of the options." }),
  description,
  statements: z
    .array(z.enum(ownerStatementCodes, { error: "Since the set came back: tick from the list." }))
    .max(ownerStatementCodes.length)
    .default([]),
  /** Upload tickets from the shared photo upload path (lib/server/uploads), attached with the claim. */
  photos: z.array(z.string().min(1).max(4000)).max(MAX_CLAIM_PHOTOS, `Photos: ${MAX_CLAIM_PHOTOS} at most.`).default([]),
};

/** The holder opens a claim from one of their certificates. */
export const openClaimSchema = z.object({ certificateId: z.string().uuid("Certificate: choose one of yours."), ...claimFields });
export type OpenClaimInput = z.input<typeof openClaimSchema>;

/** Anyone signed in as a set owner opens a claim with the code printed on the certificate. */
export const openClaimByCodeSchema = z.object({
  code: z
    .string()
    .trim()
    .min(1, "Certificate code: enter it as printed under the QR code.")
    .max(64, "Certificate code: that is not one; it is printed under the QR code."),
  ...claimFields,
});
export type OpenClaimByCodeInput = z.input<typeof openClaimByCodeSchema>;

/** The claim form: the same fields; the code is required by the server on the code path only. */
export const claimFormSchema = z.object({
  code: z.string().trim().max(64, "Certificate code: that is not one; it is printed under the QR code.").default(""),
  ...claimFields,
});
export type ClaimFormInput = z.input<typeof claimFormSchema>;

export const claimDecisions = ["accept", "reject", "inspect"] as const;
export type ClaimDecision = (typeof claimDecisions)[number];

export const decideClaimSchema = z
  .object({
    decision: z.enum(claimDecisions, { error: "Decision: choose accept, reject or inspect first." }),
    reason: z.string().trim().max(2000, "Message to the owner: keep it under 2000 characters.").default(""),
    /** Exclusions staff confirmed on the photos or the bench. */
    findings: z
      .array(z.enum(exclusionCodes, { error: "Exclusions confirmed: tick from the list." }))
      .max(exclusionCodes.length)
      .default([]),
  })
  .superRefine((v, ctx) => {
    if (v.decision === "reject" && v.reason.length < 5) {
      ctx.addIssue({
        code: "custom",
        path: ["reason"],
        message: "Message to the owner: give a reason for the rejection, at least 5 characters.",
      });
    }
  });
export type DecideClaimInput = z.input<typeof decideClaimSchema>;

export const revokeCertificateSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(5, "Reason: give one, at least 5 characters; it is shown on the verification page.")
    .max(500, "Reason: keep it under 500 characters."),
});
export const reissueCertificateSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(5, "Correction: say what it is, at least 5 characters.")
    .max(500, "Correction: keep it under 500 characters."),
});
