import { EngineError } from "../engine-error";
import type { ShopPolicy } from "../shop-policy";
import { computeDeposit } from "./deposit";
import { applyBasisPoints, checkAmount, roundHalfUpDiv } from "./money";
import type { BillingRounding } from "./billing-rounding";
import { partUnitPriceMinor, type PartCode, type PartsCatalogue } from "./parts";

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
  /** Minutes × quantity, as worked. */
  workedMinutes: number;
  /**
   * Minutes this line's labour is charged for: its own minutes rounded up to the increment under per-line
   * rounding; as worked under job rounding (the one rounding then sits in the totals). Zero when covered.
   */
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
  /** How labour minutes were rounded: once on the job's total ("job") or on each line ("line"). */
  billingRounding: BillingRounding;
  billingIncrementMinutes: number;
  /** Chargeable minutes as worked (covered lines left out). */
  workedMinutes: number;
  /** Chargeable minutes as billed: workedMinutes rounded up once (job) or the sum of rounded lines (line). */
  billedMinutes: number;
  /** billedMinutes − workedMinutes. */
  roundingMinutes: number;
  /** The labour for roundingMinutes under job rounding; included in labourMinor, on no line. Zero per line. */
  roundingLabourMinor: number;
};

export type PricedEstimate = { lines: PricedLine[]; totals: EstimateTotals };

function wholeNumber(value: number, field: string, max: number): number {
  if (!Number.isSafeInteger(value) || value < 0 || value > max) {
    throw new EngineError("not-whole", `Use a whole number from 0 to ${max}.`, field);
  }
  return value;
}

/**
 * Sets each line's labourMinor to floor(numerator / denominator) and hands the units left to reach the
 * total to the lines with the largest remainders (earlier lines first on a tie).
 */
function allocateLargestRemainder(lines: PricedLine[], numerators: number[], denominator: number, total: number): void {
  let given = 0;
  numerators.forEach((n, i) => {
    lines[i].labourMinor = Math.floor(n / denominator);
    given += lines[i].labourMinor;
  });
  const order = numerators.map((n, i) => ({ i, rem: n % denominator })).sort((a, b) => b.rem - a.rem || a.i - b.i);
  for (let k = 0; k < total - given; k++) lines[order[k].i].labourMinor += 1;
}

const roundUpTo = (minutes: number, increment: number) => Math.ceil(minutes / increment) * increment;

/**
 * Prices an estimate. Labour: minutes × quantity at the hourly rate, rounded up to the billing increment
 * once on the job's chargeable total (the default), or on each line when the shop chooses per-line
 * rounding. Parts: the line's own cost, else the catalogue's (by checklist part code), with markup, per unit. Tax: on the labour and parts
 * totals separately, at their own rates. Each money division rounds half up, once.
 */
export function priceEstimate(lines: readonly EstimateLineInput[], policy: ShopPolicy, catalogue: PartsCatalogue = {}): PricedEstimate {
  const increment = policy.billingIncrementMinutes;
  const perLine = policy.billingRounding === "line";
  const priced = lines.map((line, i): PricedLine => {
    const minutes = wholeNumber(line.minutes, `lines.${i}.minutes`, 6000);
    const quantity = wholeNumber(line.quantity, `lines.${i}.quantity`, 1000);
    const covered = line.covered === true;
    const workedMinutes = minutes * quantity;
    const billedMinutes = covered ? 0 : perLine ? roundUpTo(workedMinutes, increment) : workedMinutes;
    const parts = (line.parts ?? []).map((part, j): PricedPart => {
      const field = `lines.${i}.parts.${j}`;
      const entry = Object.hasOwn(catalogue, part.code) ? catalogue[part.code] : undefined;
      const unitCostMinor = part.unitCostMinor ?? entry?.costMinor;
      if (unitCostMinor === undefined) {
        throw new EngineError("unknown-part", `Part ${part.code} is not in the catalogue; give its cost.`, `${field}.unitCostMinor`);
      }
      checkAmount(unitCostMinor, `${field}.unitCostMinor`);
      const markupBp = part.markupBp ?? entry?.markupBp ?? policy.parts.defaultMarkupBp;
      const q = wholeNumber(part.quantity, `${field}.quantity`, 1000);
      const unitPriceMinor = partUnitPriceMinor(unitCostMinor, markupBp, `${field}.unitCostMinor`);
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
    // labourMinor is shared out below, once the labour total is known.
    return {
      code: line.code,
      title: line.title,
      minutes,
      quantity,
      workedMinutes,
      billedMinutes,
      labourMinor: 0,
      parts,
      partsMinor,
      covered,
    };
  });

  const workedMinutes = priced.reduce((s, l) => s + (l.covered ? 0 : l.workedMinutes), 0);
  const lineBilledMinutes = priced.reduce((s, l) => s + l.billedMinutes, 0);
  const billedMinutes = perLine ? lineBilledMinutes : roundUpTo(workedMinutes, increment);
  const rate = policy.labourRateMinorPerHour;
  // Money is rounded once too: the labour total is billed minutes × rate, rounded half up; the lines share
  // the labour for the time they list by largest remainder, so lines + rounding add up to it exactly.
  const labourMinor = checkAmount(roundHalfUpDiv(billedMinutes * rate, 60), "totals.labourMinor");
  const linesLabourMinor = roundHalfUpDiv(lineBilledMinutes * rate, 60);
  const roundingLabourMinor = labourMinor - linesLabourMinor;
  allocateLargestRemainder(
    priced,
    priced.map((l) => l.billedMinutes * rate),
    60,
    linesLabourMinor,
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
      billingRounding: perLine ? "line" : "job",
      billingIncrementMinutes: increment,
      workedMinutes,
      billedMinutes,
      roundingMinutes: billedMinutes - workedMinutes,
      roundingLabourMinor,
    },
  };
}
