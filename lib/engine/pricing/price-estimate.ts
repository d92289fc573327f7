import { EngineError } from "../engine-error";
import type { ShopPolicy } from "../shop-policy";
import { computeDeposit } from "./deposit";
import { applyBasisPoints, checkAmount, roundHalfUpDiv } from "./money";
import { partCodeSchema, type PartCode } from "./parts";

export type EstimatePartInput =
  | { code: PartCode; quantity: number; unitCostMinor?: number; markupBp?: number; title?: string }
  | { code: string; quantity: number; unitCostMinor: number; markupBp?: number; title: string };

export type EstimateLineInput = {
  code: string;
  title: string;
  minutes: number;
  quantity: number;
  parts?: readonly EstimatePartInput[];
  /** A warranty line: listed, but charged at zero. */
  covered?: boolean;
};

export type PricedPart = {
  code: string;
  title: string;
  quantity: number;
  unitCostMinor: number;
  unitPriceMinor: number;
  priceMinor: number;
};

export type PricedLine = {
  code: string;
  title: string;
  minutes: number;
  quantity: number;
  billedMinutes: number;
  labourMinor: number;
  parts: PricedPart[];
  partsMinor: number;
  covered: boolean;
};

export type EstimateTotals = {
  currency: string;
  exponent: number;
  labourMinor: number;
  partsMinor: number;
  labourTaxMinor: number;
  partsTaxMinor: number;
  taxMinor: number;
  totalMinor: number;
  depositMinor: number;
  balanceMinor: number;
  billedMinutes: number;
};

export type PricedEstimate = { lines: PricedLine[]; totals: EstimateTotals };

function wholeNumber(value: number, field: string, max: number): number {
  if (!Number.isSafeInteger(value) || value < 0 || value > max) {
    throw new EngineError("not-whole", `Use a whole number from 0 to ${max}.`, field);
  }
  return value;
}

/**
 * Prices an estimate. Labour: each line's minutes × quantity rounded up to the billing increment, at
 * the hourly rate. Parts: catalogue cost (or the line's own) with markup, per unit. Tax: on the labour
 * and parts totals separately, at their own rates. Each of these divisions rounds half up, once.
 */
export function priceEstimate(lines: readonly EstimateLineInput[], policy: ShopPolicy): PricedEstimate {
  const increment = policy.billingIncrementMinutes;
  const priced = lines.map((line, i): PricedLine => {
    const minutes = wholeNumber(line.minutes, `lines.${i}.minutes`, 6000);
    const quantity = wholeNumber(line.quantity, `lines.${i}.quantity`, 1000);
    const covered = line.covered === true;
    const billedMinutes = Math.ceil((minutes * quantity) / increment) * increment;
    const labourMinor = covered ? 0 : roundHalfUpDiv(billedMinutes * policy.labourRateMinorPerHour, 60);
    const parts = (line.parts ?? []).map((part, j): PricedPart => {
      const field = `lines.${i}.parts.${j}`;
      const known = partCodeSchema.safeParse(part.code);
      const entry = known.success ? policy.parts.catalogue[known.data] : undefined;
      const unitCostMinor = part.unitCostMinor ?? entry?.costMinor;
      if (unitCostMinor === undefined) {
        throw new EngineError("unknown-part", `Part ${part.code} is not in the catalogue; give its cost.`, `${field}.unitCostMinor`);
      }
      checkAmount(unitCostMinor, `${field}.unitCostMinor`);
      const markupBp = part.markupBp ?? entry?.markupBp ?? policy.parts.defaultMarkupBp;
      const q = wholeNumber(part.quantity, `${field}.quantity`, 1000);
      const unitPriceMinor = applyBasisPoints(unitCostMinor, 10_000 + markupBp);
      return {
        code: part.code,
        title: part.title ?? entry?.title ?? part.code,
        quantity: q,
        unitCostMinor,
        unitPriceMinor,
        priceMinor: covered ? 0 : unitPriceMinor * q,
      };
    });
    const partsMinor = parts.reduce((s, p) => s + p.priceMinor, 0);
    return { code: line.code, title: line.title, minutes, quantity, billedMinutes, labourMinor, parts, partsMinor, covered };
  });

  const labourMinor = checkAmount(
    priced.reduce((s, l) => s + l.labourMinor, 0),
    "totals.labourMinor",
  );
  const partsMinor = checkAmount(
    priced.reduce((s, l) => s + l.partsMinor, 0),
    "totals.partsMinor",
  );
  const labourTaxMinor = applyBasisPoints(labourMinor, policy.tax.labourBp);
  const partsTaxMinor = applyBasisPoints(partsMinor, policy.tax.partsBp);
  const taxMinor = labourTaxMinor + partsTaxMinor;
  const totalMinor = checkAmount(labourMinor + partsMinor + taxMinor, "totals.totalMinor");
  const depositMinor = computeDeposit({ totalMinor, partsMinor }, policy.deposit);
  return {
    lines: priced,
    totals: {
      currency: policy.currency.code,
      exponent: policy.currency.exponent,
      labourMinor,
      partsMinor,
      labourTaxMinor,
      partsTaxMinor,
      taxMinor,
      totalMinor,
      depositMinor,
      balanceMinor: totalMinor - depositMinor,
      billedMinutes: priced.reduce((s, l) => s + l.billedMinutes, 0),
    },
  };
}
