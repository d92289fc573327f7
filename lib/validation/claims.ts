import { z } from "zod";
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
  .string({ error: "Describe what happens." })
  .trim()
  .min(10, "Tell us a little more: at least 10 characters.")
  .max(4000, "Keep it under 4000 characters.");

const claimFields = {
  symptomCategory: z.enum(claimSymptoms, { error: "Choose what the set does." }),
  description,
  statements: z.array(ownerStatementSchema).max(ownerStatementCodes.length).default([]),
  /** Upload tickets from the shared photo upload path (lib/server/uploads), attached with the claim. */
  photos: z.array(z.string().min(1).max(4000)).max(MAX_CLAIM_PHOTOS, `Attach at most ${MAX_CLAIM_PHOTOS} photos.`).default([]),
};

/** The holder opens a claim from one of their certificates. */
export const openClaimSchema = z.object({ certificateId: z.string().uuid("Choose a certificate."), ...claimFields });
export type OpenClaimInput = z.input<typeof openClaimSchema>;

/** Anyone signed in as a set owner opens a claim with the code printed on the certificate. */
export const openClaimByCodeSchema = z.object({
  code: z.string().trim().min(1, "Enter the certificate code.").max(64, "That is not a certificate code."),
  ...claimFields,
});
export type OpenClaimByCodeInput = z.input<typeof openClaimByCodeSchema>;

/** The claim form: the same fields; the code is required by the server on the code path only. */
export const claimFormSchema = z.object({ code: z.string().trim().max(64, "That is not a certificate code.").default(""), ...claimFields });
export type ClaimFormInput = z.input<typeof claimFormSchema>;

export const claimDecisions = ["accept", "reject", "inspect"] as const;
export type ClaimDecision = (typeof claimDecisions)[number];

export const decideClaimSchema = z
  .object({
    decision: z.enum(claimDecisions, { error: "Choose a decision." }),
    reason: z.string().trim().max(2000, "Keep it under 2000 characters.").default(""),
    /** Exclusions staff confirmed on the photos or the bench. */
    findings: z.array(z.enum(exclusionCodes)).max(exclusionCodes.length).default([]),
  })
  .superRefine((v, ctx) => {
    if (v.decision === "reject" && v.reason.length < 5) {
      ctx.addIssue({ code: "custom", path: ["reason"], message: "Give the owner a reason for the rejection." });
    }
  });
export type DecideClaimInput = z.input<typeof decideClaimSchema>;

export const revokeCertificateSchema = z.object({
  reason: z.string().trim().min(5, "Give a reason: it is shown on the verification page.").max(500, "Keep it under 500 characters."),
});
export const reissueCertificateSchema = z.object({
  reason: z.string().trim().min(5, "Say what the correction is.").max(500, "Keep it under 500 characters."),
});
