import { z } from "@/lib/engine/zod";
import "./field-words";
import { ruleCodes, ruleCodeSchema } from "@/lib/engine/checklist/rules";
import { billingRoundings } from "@/lib/engine/pricing/billing-rounding";
import { canonicalTimeZone } from "@/lib/engine/dates";
import { formatMinor, toMinor } from "@/lib/engine/pricing/money";
import { REFUND_KINDS } from "@/lib/engine/pricing/account";
import { MAX_AMOUNT_MINOR, shopPolicySchema, type ShopPolicy } from "@/lib/engine/shop-policy";
import { toleranceSettingsSchema } from "@/lib/engine/verdicts/tolerances";
import {
  coveredWording,
  coveredWordingKeys,
  coveredWordingKeySchema,
  exclusionCodes,
  exclusionCodeSchema,
  exclusionWording,
} from "@/lib/engine/warranty/exclusions";

// ─── Warranty terms (free text kept in shop_settings.warranty_terms, printed on certificates) ───
// Field names are the ones the certificate reads (lib/engine/certificates/document.ts reads them field by field).

const termsText = (label: string, max: number) =>
  z
    .string()
    .trim()
    .min(1, `${label}: this cannot be empty.`)
    .max(max, `${label}: keep it under ${max.toLocaleString("en-US")} characters.`);

export const warrantyTermsSchema = z.object({
  /** Whether a later owner of the set (a buyer, an heir) keeps the coverage for the rest of the term. */
  transferable: z.boolean(),
  /** Who may claim, in the shop's words. */
  whoIsCovered: termsText("Who is covered", 1000),
  /** What the shop will do and pay for when a claim is accepted. */
  whatWeWillDo: termsText("What the shop will do", 1500),
  /** What the shop will not do or pay for, beyond the listed exclusions. */
  whatWeWillNotDo: termsText("What the shop will not do", 1500),
  /** Claim procedure, one step per entry, printed as a numbered list. */
  howToClaim: z
    .array(termsText("A claim step", 400))
    .min(1, "How to make a claim: give at least one step.")
    .max(10, "How to make a claim: ten steps at most."),
  /** How a disagreement about a claim is settled. */
  disputes: termsText("Disputes", 1000),
  /** Any limit on implied warranties, with the local-law caveat. */
  impliedWarranties: termsText("Implied warranties", 1000),
  /** Any exclusion of incidental or consequential damages, with the local-law caveat. */
  consequentialDamages: termsText("Incidental and consequential damages", 1000),
  /** Anything else the shop wants printed, as written. May be blank. */
  shopWording: z.string().trim().max(4000, "The shop's own wording: keep it under 4,000 characters."),
});
export type WarrantyTerms = z.infer<typeof warrantyTermsSchema>;

export const defaultWarrantyTerms: WarrantyTerms = {
  transferable: true,
  whoIsCovered:
    "The owner of the set during the term. If the set is sold or given away, the new owner is covered for the rest of the term on showing this certificate's code.",
  whatWeWillDo:
    "If a fault comes from the work or parts listed on this certificate, we will repair it again at no charge for labour or parts; if we cannot, we will refund the price of the affected work.",
  whatWeWillNotDo: "We do not pay for shipping the set to us, for faults outside the work and parts listed, or for the exclusions below.",
  howToClaim: [
    "Unplug the set (and take out any batteries) and do not use it until we have looked at the fault.",
    "Open a claim in the Bandedge portal under Warranty claims, or with this certificate's code, and describe the symptom; add photos if you can.",
    "Wait for our answer by e-mail before sending the set: we may ask to inspect it first. Then send or bring it to the shop address on this certificate.",
  ],
  disputes: "If you disagree with our decision, write to us at the address above and the shop owner will review it.",
  impliedWarranties:
    "Any implied warranty lasts only as long as this warranty's term. Some states do not allow limits on how long an implied warranty lasts, so this limit may not apply to you.",
  consequentialDamages:
    "We are not responsible for incidental or consequential damages. Some states do not allow the exclusion or limitation of incidental or consequential damages, so this limitation may not apply to you.",
  shopWording: "",
};

/** Stored terms, field by field over the defaults; a damaged row never breaks the form or a certificate. */
export function parseWarrantyTerms(raw: unknown): WarrantyTerms {
  const base = raw && typeof raw === "object" && !Array.isArray(raw) ? (raw as Record<string, unknown>) : {};
  const merged: Record<string, unknown> = { ...defaultWarrantyTerms };
  for (const key of Object.keys(defaultWarrantyTerms) as (keyof WarrantyTerms)[]) {
    const one = warrantyTermsSchema.shape[key].safeParse(base[key]);
    if (one.success) merged[key] = one.data;
  }
  return warrantyTermsSchema.parse(merged);
}

type ShopIdentity = { name: string; addressLines: string[]; phone: string; email: string; taxNumber: string; timeZone: string };

/** An IANA zone name ("America/New_York", "Europe/London"), as the system's time-zone data knows it. */
export const timeZoneText = z
  .string()
  .trim()
  .min(1, "Time zone: choose the shop's time zone, such as America/New_York or Europe/London.")
  .max(64, "Time zone: a zone name is at most 64 characters.")
  .refine(
    (s) => canonicalTimeZone(s) !== null,
    "Time zone: not a known time zone. Use a region name from the list, such as America/New_York or Europe/London; offsets such as +01:00 are not accepted.",
  );

// ─── The office settings form (shared by the form and the server) ───

/** Amounts typed in the currency's major unit ("90.00"); converted with the engine's toMinor. */
const moneyText = (label: string) =>
  z
    .string()
    .trim()
    .regex(/^\d{1,8}(\.\d{1,3})?$/, `${label}: write an amount of 0 or more such as 90.00, digits and a decimal point only.`);

/** Percentages typed with at most two decimals ("8.25"), stored as basis points (825). */
const percentText = (label: string) =>
  z
    .string()
    .trim()
    .regex(/^\d{1,4}(\.\d{1,2})?$/, `${label}: write a percentage of 0 or more such as 8.25, with at most two decimals.`);

const wholeNumber = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label}: enter a whole number from ${min} to ${max}.` })
    .int()
    .min(min)
    .max(max);

const emailOrBlank = z.union([
  z.literal(""),
  z.string().trim().toLowerCase().email("E-mail: enter an address such as shop@example.com, or leave it blank.").max(254),
]);

export const settingsFormSchema = z
  .object({
    version: z
      .number()
      .int()
      .min(0)
      .max(2 ** 31 - 1),
    identity: z.object({
      name: z
        .string()
        .trim()
        .min(1, "Shop name: give one; it is printed on every certificate.")
        .max(120, "Shop name: keep it under 120 characters."),
      /** One address line per line of the text box. */
      addressText: z
        .string()
        .max(800, "Address: keep it under 800 characters.")
        .refine((s) => addressLines(s).length >= 1, "Address: give the shop's address; it is printed on every certificate.")
        .refine((s) => addressLines(s).length <= 6, "Address: six lines at most.")
        .refine((s) => addressLines(s).every((l) => l.length <= 120), "Address: keep each line under 120 characters."),
      phone: z.string().trim().max(40, "Phone: keep it under 40 characters."),
      email: emailOrBlank,
      /** Sales-tax or VAT registration; blank when the shop has none (then nothing is printed). */
      taxNumber: z
        .string()
        .trim()
        .max(32, "Tax number: keep it under 32 characters.")
        .regex(
          /^$|^[A-Za-z0-9][A-Za-z0-9 ./-]*$/,
          "Tax number: letters, digits, spaces, dots, slashes and hyphens only, or leave it blank.",
        ),
      /** Every date and time shown to people, in pages, e-mails and certificates, is in this zone. */
      timeZone: timeZoneText,
    }),
    currency: z.object({
      code: z.string().regex(/^[A-Z]{3}$/, "Currency: a three-letter code such as USD."),
      exponent: z.number({ error: "Currency decimals: a whole number from 0 to 3." }).int().min(0).max(3),
    }),
    labourRate: moneyText("Labour rate"),
    billingIncrementMinutes: wholeNumber("Billing increment", 1, 240),
    billingRounding: z.enum(billingRoundings, { error: "Labour rounding: choose whether labour is rounded once per job or on each line." }),
    minutesPerRule: z.array(z.object({ code: ruleCodeSchema, minutes: wholeNumber("Minutes", 0, 6000) })),
    parts: z.object({ defaultMarkupPercent: percentText("Default markup") }),
    tax: z.object({ labourPercent: percentText("Labour tax"), partsPercent: percentText("Parts tax") }),
    deposit: z.object({ percent: percentText("Deposit"), atLeastParts: z.boolean(), processorMinimum: moneyText("Processor minimum") }),
    warranty: z.object({
      termDays: wholeNumber("Warranty term", 0, 3650),
      designation: z.enum(["limited", "full"]),
      /** Form-only: the owner confirms the terms meet the minimum standards for a full warranty. */
      fullAcknowledged: z.boolean(),
      coveredKeys: z.array(coveredWordingKeySchema),
      excludedKeys: z.array(exclusionCodeSchema),
    }),
    warrantyTerms: warrantyTermsSchema,
    tolerances: toleranceSettingsSchema,
  })
  .superRefine((v, ctx) => {
    const exp = v.currency.exponent;
    const money = (value: string, path: (string | number)[], label: string) => {
      const m = /^(\d+)(?:\.(\d+))?$/.exec(value.trim());
      if (!m) return;
      if ((m[2] ?? "").length > exp) {
        ctx.addIssue({
          code: "custom",
          path,
          message:
            exp === 0 ? `${label}: ${v.currency.code} has no decimal places.` : `${label}: ${v.currency.code} has ${exp} decimal places.`,
        });
        return;
      }
      if (Number(m[1] + (m[2] ?? "").padEnd(exp, "0")) > MAX_AMOUNT_MINOR)
        ctx.addIssue({ code: "custom", path, message: `${label}: that is above what the payment processor accepts.` });
    };
    const percent = (value: string, path: (string | number)[], label: string, max: number) => {
      if (!/^\d{1,4}(\.\d{1,2})?$/.test(value.trim())) return;
      if (Number(value) > max) ctx.addIssue({ code: "custom", path, message: `${label}: at most ${max} %.` });
    };
    money(v.labourRate, ["labourRate"], "Labour rate");
    money(v.deposit.processorMinimum, ["deposit", "processorMinimum"], "Processor minimum");
    percent(v.parts.defaultMarkupPercent, ["parts", "defaultMarkupPercent"], "Default markup", 1000);
    percent(v.tax.labourPercent, ["tax", "labourPercent"], "Labour tax", 100);
    percent(v.tax.partsPercent, ["tax", "partsPercent"], "Parts tax", 100);
    percent(v.deposit.percent, ["deposit", "percent"], "Deposit", 100);

    const seenRules = new Set(v.minutesPerRule.map((r) => r.code));
    if (seenRules.size !== v.minutesPerRule.length || ruleCodes.some((c) => !seenRules.has(c))) {
      ctx.addIssue({ code: "custom", path: ["minutesPerRule"], message: "Every checklist rule needs its minutes, once." });
    }
    if (new Set(v.warranty.coveredKeys).size !== v.warranty.coveredKeys.length) {
      ctx.addIssue({ code: "custom", path: ["warranty", "coveredKeys"], message: "Each covered item once." });
    }
    if (v.warranty.coveredKeys.length === 0) {
      ctx.addIssue({
        code: "custom",
        path: ["warranty", "coveredKeys"],
        message: "A warranty has to cover something: tick at least one item.",
      });
    }
    if (new Set(v.warranty.excludedKeys).size !== v.warranty.excludedKeys.length) {
      ctx.addIssue({ code: "custom", path: ["warranty", "excludedKeys"], message: "Each exclusion once." });
    }
    if (v.warranty.designation === "full") {
      if (!v.warranty.fullAcknowledged) {
        ctx.addIssue({
          code: "custom",
          path: ["warranty", "fullAcknowledged"],
          message: "Confirm that these terms meet the minimum standards for a full warranty, or keep the limited designation.",
        });
      }
      if (!v.warrantyTerms.transferable) {
        ctx.addIssue({
          code: "custom",
          path: ["warrantyTerms", "transferable"],
          message: "A full warranty covers everyone who owns the set during the term: let the coverage pass to a later owner.",
        });
      }
      if (v.warranty.termDays === 0) {
        ctx.addIssue({ code: "custom", path: ["warranty", "termDays"], message: "A full warranty needs a term of at least one day." });
      }
    }
  });

export type SettingsFormValues = z.infer<typeof settingsFormSchema>;

export function addressLines(text: string): string[] {
  return text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter((l) => l.length > 0);
}

const pct = (bp: number) => formatMinor(bp, 2);
const bpOf = (percent: string, field: string) => toMinor(percent, 2, field);

/** The stored settings as the form shows them: money in major units, basis points as percentages. */
export function settingsToForm(shop: {
  name: string;
  addressLines: string[];
  phone: string;
  email: string;
  taxNumber?: string;
  timeZone: string;
  policy: ShopPolicy;
  warrantyTerms: unknown;
  version: number;
}): SettingsFormValues {
  const p = shop.policy;
  const exp = p.currency.exponent;
  return {
    version: shop.version,
    identity: {
      name: shop.name,
      addressText: shop.addressLines.join("\n"),
      phone: shop.phone,
      email: shop.email,
      taxNumber: shop.taxNumber ?? "",
      timeZone: shop.timeZone,
    },
    currency: { ...p.currency },
    labourRate: formatMinor(p.labourRateMinorPerHour, exp),
    billingIncrementMinutes: p.billingIncrementMinutes,
    billingRounding: p.billingRounding,
    minutesPerRule: ruleCodes.map((code) => ({ code, minutes: p.minutesPerRule[code] ?? 0 })),
    parts: { defaultMarkupPercent: pct(p.parts.defaultMarkupBp) },
    tax: { labourPercent: pct(p.tax.labourBp), partsPercent: pct(p.tax.partsBp) },
    deposit: {
      percent: pct(p.deposit.percentBp),
      atLeastParts: p.deposit.atLeastParts,
      processorMinimum: formatMinor(p.deposit.processorMinimumMinor, exp),
    },
    warranty: {
      termDays: p.warranty.termDays,
      designation: p.warranty.designation,
      fullAcknowledged: p.warranty.designation === "full",
      coveredKeys: [...p.warranty.coveredKeys],
      excludedKeys: [...p.warranty.excludedKeys],
    },
    warrantyTerms: parseWarrantyTerms(shop.warrantyTerms),
    tolerances: structuredClone(p.tolerances),
  };
}

/** The form's values as stored: identity columns, the engine's policy (checked by its schema) and the terms. */
export function settingsFromForm(v: SettingsFormValues): { identity: ShopIdentity; policy: ShopPolicy; warrantyTerms: WarrantyTerms } {
  const exp = v.currency.exponent;
  const policy: ShopPolicy = {
    currency: { ...v.currency },
    labourRateMinorPerHour: toMinor(v.labourRate, exp, "labourRate"),
    billingIncrementMinutes: v.billingIncrementMinutes,
    billingRounding: v.billingRounding,
    minutesPerRule: Object.fromEntries(v.minutesPerRule.map((r) => [r.code, r.minutes])) as ShopPolicy["minutesPerRule"],
    parts: { defaultMarkupBp: bpOf(v.parts.defaultMarkupPercent, "parts.defaultMarkupPercent") },
    tax: { labourBp: bpOf(v.tax.labourPercent, "tax.labourPercent"), partsBp: bpOf(v.tax.partsPercent, "tax.partsPercent") },
    deposit: {
      percentBp: bpOf(v.deposit.percent, "deposit.percent"),
      atLeastParts: v.deposit.atLeastParts,
      processorMinimumMinor: toMinor(v.deposit.processorMinimum, exp, "deposit.processorMinimum"),
    },
    warranty: {
      termDays: v.warranty.termDays,
      designation: v.warranty.designation,
      // Printed in the engine's order, whatever order the boxes were ticked in.
      coveredKeys: coveredWordingKeys.filter((k) => v.warranty.coveredKeys.includes(k)),
      excludedKeys: exclusionCodes.filter((k) => v.warranty.excludedKeys.includes(k)),
    },
    tolerances: structuredClone(v.tolerances),
  };
  return {
    identity: {
      name: v.identity.name.trim(),
      addressLines: addressLines(v.identity.addressText),
      phone: v.identity.phone.trim(),
      email: v.identity.email.trim(),
      taxNumber: v.identity.taxNumber.trim().replace(/\s+/g, " "),
      timeZone: canonicalTimeZone(v.identity.timeZone) ?? v.identity.timeZone.trim(),
    },
    policy: shopPolicySchema.parse(policy),
    warrantyTerms: warrantyTermsSchema.parse(v.warrantyTerms),
  };
}

export { coveredWording, exclusionWording };

// ─── Refunds ───

const refundKindSchema = z.enum(REFUND_KINDS, {
  error: "Kind: choose whether this gives back money paid beyond the total or lowers the price.",
});

/**
 * The office's refund form. kind: "return" gives back money held beyond the total (the price stands);
 * "reduction" lowers the price by the amount and gives it back (goodwill). The form always asks.
 */
export const refundFormSchema = z.object({
  /** Typed in the major unit; the server converts with the payment's currency and checks what is left. */
  amount: moneyText("Amount").refine((s) => Number(s) > 0, "Amount: a refund must be more than zero."),
  reason: z
    .string()
    .trim()
    .min(3, "Reason: say why the money goes back, at least 3 characters; it is kept in the audit log.")
    .max(500, "Reason: keep it under 500 characters."),
  kind: refundKindSchema,
});
export type RefundFormValues = z.infer<typeof refundFormSchema>;

/** What the refund route accepts: the form's fields, a kind left out meaning a return (as every earlier refund). */
export const refundRequestSchema = refundFormSchema.extend({ kind: refundKindSchema.default("return") });
/** What a caller may hand the refund service (the kind may be left out). */
export type RefundFormInput = z.input<typeof refundRequestSchema>;

// ─── Audit log and reports filters (query strings) ───

const isoDay = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date such as 2026-03-01.");
const blankToUndefined = (v: unknown) => (v === "" || v === null ? undefined : v);

export const auditFilterSchema = z.object({
  actor: z.preprocess(blankToUndefined, z.string().max(200).optional()),
  entity: z.preprocess(blankToUndefined, z.string().max(100).optional()),
  action: z.preprocess(blankToUndefined, z.string().max(100).optional()),
  from: z.preprocess(blankToUndefined, isoDay.optional()),
  to: z.preprocess(blankToUndefined, isoDay.optional()),
  page: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).max(100_000).default(1)),
});
export type AuditFilter = z.infer<typeof auditFilterSchema>;

const isoMonth = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, "Use a month such as 2026-03.");
export const reportRangeSchema = z
  .object({ from: z.preprocess(blankToUndefined, isoMonth.optional()), to: z.preprocess(blankToUndefined, isoMonth.optional()) })
  .refine((r) => !r.from || !r.to || r.from <= r.to, { path: ["to"], message: "The end month comes after the start month." });
export type ReportRange = z.infer<typeof reportRangeSchema>;

// ─── Money taken by hand at the counter ───

export const MANUAL_PAYMENT_METHODS = ["cash", "cheque"] as const;

export const manualPaymentSchema = z.object({
  /** The job as printed on its ticket (KL-0042) or just its number. */
  job: z
    .string()
    .trim()
    .regex(/^(KL-?)?\d{1,7}$/i, "Job: the job number as on its ticket, such as KL-0042."),
  /** Typed in the major unit; the server converts with the job's currency and checks what is owed. */
  amount: moneyText("Amount").refine((s) => Number(s) > 0, "Amount: a payment must be more than zero."),
  method: z.enum(MANUAL_PAYMENT_METHODS, { error: "Method: choose cash or cheque." }),
  chequeNumber: z
    .string()
    .trim()
    .max(30, "Cheque number: keep it under 30 characters.")
    .regex(/^[A-Za-z0-9 -]*$/, "Cheque number: letters, digits, spaces and hyphens only.")
    .optional(),
  receivedOn: isoDayField("Paid on"),
  /** Made by the form when it opens: a second submit of the same form records nothing more. */
  idempotencyKey: z.string().trim().min(8, "Form key: reload the page and try again.").max(100, "Form key: reload the page and try again."),
});
export type ManualPaymentValues = z.infer<typeof manualPaymentSchema>;

export const voidPaymentSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(3, "Reason: say why this entry was a mistake, at least 3 characters; it is kept in the audit log.")
    .max(500, "Reason: keep it under 500 characters."),
});
export type VoidPaymentValues = z.infer<typeof voidPaymentSchema>;

function isoDayField(label: string) {
  return z
    .string()
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, `${label}: a date such as 2026-03-01.`)
    .refine(
      (s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s),
      `${label}: a date such as 2026-03-01.`,
    );
}
