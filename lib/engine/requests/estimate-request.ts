import { z } from "../zod";
import { computeCautions, type Caution } from "../checklist/cautions";
import { computeChecklist } from "../checklist/compute-checklist";
import { billingNote } from "../pricing/billing-note";
import type { BillingRounding } from "../pricing/billing-rounding";
import type { ChecklistCategory } from "../checklist/rules";
import { setProfileSchema } from "../checklist/profile";
import { priceEstimate, type PricedPart } from "../pricing/price-estimate";
import type { PartsCatalogue } from "../pricing/parts";
import type { ShopPolicy } from "../shop-policy";
import { listRequiredReadings } from "../verdicts/required-readings";
import type { ReadingRequirement } from "../verdicts/judge-reading";

/*
 * POST /api/tools/estimate. Money in integer minor units of the shop's currency.
 *
 *   request:  { "profile": { "kind": "tube-acdc",
 *               "bands": [{ "kind": "MW", "lowKHz": 540, "highKHz": 1600, "ifKHz": 455 }],
 *               "electrolytics": 3, "paperCapacitors": 9, "tubes": 5, "lineCordWorn": true } }
 *   response: { "lines": [{ "code": "safety.isolation-bench", "title": "Isolation-transformer bench setup",
 *               "category": "safety", "minutes": 10, "quantity": 1, "reason": "AC/DC set: …",
 *               "readings": [] }, …, { "code": "test.leakage", …, "readings": ["leakage.plug-a", "leakage.plug-b"] }],
 *               "totals": { "currency": "USD", "labourMinor": 63000, "partsMinor": 6051, "taxMinor": 484,
 *                           "totalMinor": 69535, "depositMinor": 20861, "balanceMinor": 48674 } }
 *
 * Each line's minutes are per unit. Labour minutes are rounded up to the billing increment once on the
 * job's total by default ("billingRounding": "job"; the rounding's labour is in totals.roundingLabourMinor
 * and on no line), or on each line when the shop chooses "line". Added fields: totals.billingRounding,
 * billingIncrementMinutes, workedMinutes, billedMinutes, roundingMinutes, roundingLabourMinor, billingNote,
 * and "cautions": [{ "id", "text" }] for the set.
 */
export const estimateRequestSchema = z.object({ profile: setProfileSchema });
export type EstimateRequest = z.infer<typeof estimateRequestSchema>;

export type EstimateResponseLine = {
  code: string;
  title: string;
  category: ChecklistCategory;
  minutes: number;
  quantity: number;
  reason: string;
  readings: string[];
  billedMinutes: number;
  labourMinor: number;
  partsMinor: number;
  parts: PricedPart[];
};

export type EstimateResponse = {
  lines: EstimateResponseLine[];
  totals: {
    currency: string;
    exponent: number;
    labourMinor: number;
    partsMinor: number;
    taxMinor: number;
    labourTaxMinor: number;
    partsTaxMinor: number;
    totalMinor: number;
    depositMinor: number;
    balanceMinor: number;
    billingRounding: BillingRounding;
    billingIncrementMinutes: number;
    workedMinutes: number;
    billedMinutes: number;
    roundingMinutes: number;
    roundingLabourMinor: number;
    billingNote: string;
  };
  readings: ReadingRequirement[];
  cautions: Caution[];
};

/** Set profile → checklist → priced estimate, with the shop policy and the catalogue's checklist parts in force. */
export function runEstimateTool(input: EstimateRequest, policy: ShopPolicy, catalogue: PartsCatalogue): EstimateResponse {
  const lines = computeChecklist(input.profile, policy);
  const priced = priceEstimate(lines, policy, catalogue);
  const t = priced.totals;
  return {
    lines: lines.map((line, i) => ({
      code: line.code,
      title: line.title,
      category: line.category,
      minutes: line.minutes,
      quantity: line.quantity,
      reason: line.reason,
      readings: line.readings,
      billedMinutes: priced.lines[i].billedMinutes,
      labourMinor: priced.lines[i].labourMinor,
      partsMinor: priced.lines[i].partsMinor,
      parts: priced.lines[i].parts,
    })),
    totals: {
      currency: t.currency,
      exponent: t.exponent,
      labourMinor: t.labourMinor,
      partsMinor: t.partsMinor,
      taxMinor: t.taxMinor,
      labourTaxMinor: t.labourTaxMinor,
      partsTaxMinor: t.partsTaxMinor,
      totalMinor: t.totalMinor,
      depositMinor: t.depositMinor,
      balanceMinor: t.balanceMinor,
      billingRounding: t.billingRounding,
      billingIncrementMinutes: t.billingIncrementMinutes,
      workedMinutes: t.workedMinutes,
      billedMinutes: t.billedMinutes,
      roundingMinutes: t.roundingMinutes,
      roundingLabourMinor: t.roundingLabourMinor,
      billingNote: billingNote(t),
    },
    readings: listRequiredReadings(input.profile, policy.tolerances),
    cautions: computeCautions(input.profile),
  };
}
