import { z } from "./zod";
import { ruleCodeSchema, defaultMinutesPerRule } from "./checklist/rules";
import { billingRoundings } from "./pricing/billing-rounding";
import { defaultTolerances, toleranceSettingsSchema } from "./verdicts/tolerances";
import { coveredWordingKeySchema, exclusionCodeSchema, exclusionCodes } from "./warranty/exclusions";

/** Processor limit: amounts up to eight digits in minor units. */
export const MAX_AMOUNT_MINOR = 99_999_999;

const minor = z.number().int().min(0).max(MAX_AMOUNT_MINOR);
const basisPoints = z.number().int().min(0).max(100_000);

/**
 * Everything the shop configures that the engine reads. Stored as JSON in one settings row and edited by
 * the office screen through this schema, so it stays plain data: no dates, no Maps, no functions.
 */
export const shopPolicySchema = z.object({
  currency: z.object({
    code: z.string().regex(/^[A-Z]{3}$/, "Use a three-letter currency code."),
    /** Digits after the decimal point: USD 2, JPY 0. */
    exponent: z.number().int().min(0).max(3),
  }),
  labourRateMinorPerHour: minor,
  billingIncrementMinutes: z.number().int().min(1).max(240),
  /** Round labour minutes up to the increment once on the job's total (default) or on every line. */
  billingRounding: z.enum(billingRoundings),
  /** Standard minutes per unit for each checklist rule. */
  minutesPerRule: z.record(ruleCodeSchema, z.number().int().min(0).max(6000)),
  /** The markup of a part with none of its own. The catalogue itself is the shop's part table. */
  parts: z.object({ defaultMarkupBp: basisPoints }),
  tax: z.object({ labourBp: z.number().int().min(0).max(10_000), partsBp: z.number().int().min(0).max(10_000) }),
  deposit: z.object({
    percentBp: z.number().int().min(0).max(10_000),
    atLeastParts: z.boolean(),
    processorMinimumMinor: minor,
  }),
  warranty: z.object({
    termDays: z.number().int().min(0).max(3650),
    /** "limited" unless the terms meet the minimum standards for a full warranty. */
    designation: z.enum(["limited", "full"]),
    coveredKeys: z.array(coveredWordingKeySchema),
    excludedKeys: z.array(exclusionCodeSchema),
  }),
  tolerances: toleranceSettingsSchema,
});

export type ShopPolicy = z.infer<typeof shopPolicySchema>;

export const defaultShopPolicy: ShopPolicy = {
  currency: { code: "USD", exponent: 2 },
  labourRateMinorPerHour: 9000,
  billingIncrementMinutes: 15,
  billingRounding: "job",
  minutesPerRule: { ...defaultMinutesPerRule },
  parts: { defaultMarkupBp: 3500 },
  tax: { labourBp: 0, partsBp: 800 },
  deposit: { percentBp: 3000, atLeastParts: true, processorMinimumMinor: 50 },
  warranty: {
    termDays: 90,
    designation: "limited",
    coveredKeys: ["covered.workmanship", "covered.parts-replaced", "covered.alignment", "covered.safety-work"],
    excludedKeys: [...exclusionCodes],
  },
  tolerances: structuredClone(defaultTolerances),
};
