import fc from "fast-check";
import { all, create } from "mathjs";
import { describe, expect, test } from "vitest";
import { EngineError } from "@/lib/engine/engine-error";
import {
  applyBasisPoints,
  billingNote,
  currencyChangeRefusal,
  checkAmount,
  computeBalance,
  computeDeposit,
  formatMinor,
  priceEstimate,
  roundHalfUpDiv,
  toMinor,
  type EstimateLineInput,
} from "@/lib/engine/pricing";
import { defaultPartsCatalogue, partUnitPriceMinor } from "@/lib/engine/pricing/parts";
import { defaultShopPolicy, MAX_AMOUNT_MINOR, shopPolicySchema, type ShopPolicy } from "@/lib/engine/shop-policy";

const policy = defaultShopPolicy;

// Oracle: mathjs in exact decimal (BigNumber) arithmetic, whose round() goes half away from zero.
const exact = create(all, { number: "BigNumber", precision: 64 });

describe("money in minor units", () => {
  test("USD 12.34 → 1234; JPY 500 → 500 (published: payment processor API documentation)", () => {
    expect(toMinor("12.34", 2)).toBe(1234);
    expect(toMinor("500", 0)).toBe(500);
    expect(formatMinor(1234, 2)).toBe("12.34");
    expect(formatMinor(5, 2)).toBe("0.05");
    expect(formatMinor(500, 0)).toBe("500");
    expect(() => toMinor("12.345", 2)).toThrow(EngineError);
    expect(() => toMinor("5.5", 0)).toThrow(EngineError);
  });

  test("at most 8 digits: 99999999 accepted, 100000000 refused (published: payment processor API documentation)", () => {
    expect(MAX_AMOUNT_MINOR).toBe(99_999_999);
    expect(checkAmount(99_999_999)).toBe(99_999_999);
    expect(() => checkAmount(100_000_000)).toThrow(EngineError);
    expect(() => toMinor("1000000.00", 2)).toThrow(EngineError);
  });

  test("rounding rule: half up, once", () => {
    expect(roundHalfUpDiv(5, 10)).toBe(1);
    expect(roundHalfUpDiv(4, 10)).toBe(0);
    expect(roundHalfUpDiv(15, 10)).toBe(2);
    expect(applyBasisPoints(1000, 825)).toBe(83); // 82.5 → 83
    expect(() => roundHalfUpDiv(1.5, 2)).toThrow(EngineError);
  });

  test("property: the rounding rule agrees with mathjs BigNumber rounding", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: MAX_AMOUNT_MINOR }), fc.integer({ min: 0, max: 10_000 }), (amount, bp) => {
        const oracle = Number(exact.evaluate(`round(${amount} * ${bp} / 10000)`).toString());
        expect(applyBasisPoints(amount, bp)).toBe(oracle);
      }),
    );
  });
});

describe("deposit policy", () => {
  const dep = { percentBp: 3000, atLeastParts: true, processorMinimumMinor: 50 };

  test("a percentage of the total", () => {
    expect(computeDeposit({ totalMinor: 10_000, partsMinor: 1000 }, dep)).toBe(3000);
  });

  test("at least the parts", () => {
    expect(computeDeposit({ totalMinor: 10_000, partsMinor: 6000 }, dep)).toBe(6000);
    expect(computeDeposit({ totalMinor: 10_000, partsMinor: 6000 }, { ...dep, atLeastParts: false })).toBe(3000);
  });

  test("at least the processor's minimum charge, USD 0.50 = 50 (published: payment processor API documentation)", () => {
    expect(policy.deposit.processorMinimumMinor).toBe(50);
    expect(computeDeposit({ totalMinor: 100, partsMinor: 0 }, dep)).toBe(50);
  });

  test("never above the total", () => {
    expect(computeDeposit({ totalMinor: 40, partsMinor: 0 }, dep)).toBe(40);
    expect(computeDeposit({ totalMinor: 0, partsMinor: 0 }, dep)).toBe(0);
  });

  test("balance adds approved additions and subtracts what was paid", () => {
    expect(computeBalance({ totalMinor: 10_000, paidMinor: 3000, additionsMinor: 1500 })).toBe(8500);
    expect(computeBalance({ totalMinor: 10_000, paidMinor: 10_000 })).toBe(0);
  });
});

describe("priceEstimate", () => {
  const lines: EstimateLineInput[] = [
    {
      code: "recap.electrolytic",
      title: "Replace electrolytic capacitors",
      minutes: 10,
      quantity: 3,
      parts: [{ code: "cap.electrolytic", quantity: 3 }],
    },
    { code: "align.if.455", title: "IF alignment", minutes: 10, quantity: 2 },
    {
      code: "extra.knob",
      title: "Knob",
      minutes: 0,
      quantity: 1,
      parts: [{ code: "knob.custom", title: "Replacement knob", quantity: 1, unitCostMinor: 1000, markupBp: 0 }],
    },
  ];

  test("labour is rounded up once on the job: 50 minutes listed are billed as 60 at 90.00/h = 90.00 (worked by hand)", () => {
    const e = priceEstimate(lines, policy, defaultPartsCatalogue);
    expect(e.totals.workedMinutes).toBe(50);
    expect(e.totals.billedMinutes).toBe(60);
    expect(e.totals.labourMinor).toBe(9000);
    // The lines carry the time they list (30 min = 45.00, 20 min = 30.00); the 10 rounded-up minutes (15.00) sit on no line.
    expect(e.lines.map((l) => l.labourMinor)).toEqual([4500, 3000, 0]);
    expect(e.totals.roundingLabourMinor).toBe(1500);
  });

  test("a part at 4.50 with 35 % markup sells at 6.08: 4.50 × 1.35 = 6.075, and the half cent rounds up (worked by hand)", () => {
    // Worked by hand: 450 × 13500 / 10000 = 607.5 minor units; half up (the one rounding rule) gives 608.
    expect(partUnitPriceMinor(450, 3500)).toBe(608);
    // Half-even rounding (banker's) would give 608 too (7 is odd → 8), so check one that tells them apart:
    // 1.50 at 35 % = 2.025 → half up 2.03 (half even would give 2.02).
    expect(partUnitPriceMinor(150, 3500)).toBe(203);
    // A cost of 0.40 at 12.5 %: 0.45 exactly, nothing to round (worked by hand).
    expect(partUnitPriceMinor(40, 1250)).toBe(45);
    // JPY has no minor digits: 450 yen at 35 % = 607.5 yen → 608 yen.
    expect(partUnitPriceMinor(toMinor("450", 0), 3500)).toBe(608);
    expect(() => partUnitPriceMinor(-1, 3500)).toThrow(EngineError);
  });

  test("a part with no cost given and no catalogue entry is refused, naming the field", () => {
    expect(() => priceEstimate(lines, policy)).toThrow(/not in the catalogue/);
  });

  test("parts carry markup; catalogue and custom parts", () => {
    const e = priceEstimate(lines, policy, defaultPartsCatalogue);
    // 450 × 1.35 = 607.5 → 608 per capacitor
    expect(e.lines[0].parts[0].unitPriceMinor).toBe(608);
    expect(e.lines[0].partsMinor).toBe(1824);
    expect(e.lines[2].partsMinor).toBe(1000);
  });

  test("separate tax rates for labour and parts: 5 % of 90.00 and 8.25 % of 28.24 (worked by hand)", () => {
    const taxed: ShopPolicy = { ...policy, tax: { labourBp: 500, partsBp: 825 } };
    const e = priceEstimate(lines, taxed, defaultPartsCatalogue);
    expect(e.totals.partsMinor).toBe(2824); // 3 × 6.08 + 10.00
    expect(e.totals.labourTaxMinor).toBe(450); // 5 % of 90.00
    expect(e.totals.partsTaxMinor).toBe(233); // 8.25 % of 28.24 = 2.3298 → 2.33
    expect(e.totals.totalMinor).toBe(12_507); // 90.00 + 28.24 + 4.50 + 2.33
  });

  test("JPY has no minor digits: the same minutes price in whole yen", () => {
    const jpy: ShopPolicy = { ...policy, currency: { code: "JPY", exponent: 0 }, labourRateMinorPerHour: 6000 };
    const e = priceEstimate([{ code: "x", title: "x", minutes: 15, quantity: 1 }], jpy);
    expect(e.totals.labourMinor).toBe(1500);
    expect(e.totals.currency).toBe("JPY");
  });

  test("covered warranty lines cost nothing", () => {
    const e = priceEstimate(
      lines.map((l) => ({ ...l, covered: true })),
      policy,
      defaultPartsCatalogue,
    );
    expect(e.totals.totalMinor).toBe(0);
    expect(e.totals.depositMinor).toBe(0);
  });

  test("bad lines name the field", () => {
    try {
      priceEstimate([{ code: "x", title: "x", minutes: 1.5, quantity: 1 }], policy);
      expect.unreachable();
    } catch (e) {
      expect((e as EngineError).field).toBe("lines.0.minutes");
    }
    expect(() =>
      priceEstimate(
        [{ code: "x", title: "x", minutes: 1, quantity: 1, parts: [{ code: "unknown.part", title: "?", quantity: 1, unitCostMinor: -1 }] }],
        policy,
      ),
    ).toThrow(EngineError);
  });

  test("the default policy satisfies its own schema", () => {
    expect(shopPolicySchema.parse(defaultShopPolicy)).toEqual(defaultShopPolicy);
    expect(JSON.parse(JSON.stringify(defaultShopPolicy))).toEqual(defaultShopPolicy);
  });

  test("property: money is conserved across tax rounding and the deposit/balance split", () => {
    const line = fc.record({
      minutes: fc.integer({ min: 0, max: 600 }),
      quantity: fc.integer({ min: 0, max: 40 }),
      cost: fc.integer({ min: 0, max: 20_000 }),
      partQty: fc.integer({ min: 0, max: 20 }),
      markupBp: fc.integer({ min: 0, max: 20_000 }),
      covered: fc.boolean(),
    });
    fc.assert(
      fc.property(
        fc.array(line, { maxLength: 25 }),
        fc.record({
          rate: fc.integer({ min: 0, max: 50_000 }),
          increment: fc.integer({ min: 1, max: 60 }),
          labourBp: fc.integer({ min: 0, max: 3000 }),
          partsBp: fc.integer({ min: 0, max: 3000 }),
          percentBp: fc.integer({ min: 0, max: 10_000 }),
          atLeastParts: fc.boolean(),
          minimum: fc.integer({ min: 0, max: 5000 }),
        }),
        (ls, p) => {
          const pol: ShopPolicy = {
            ...policy,
            labourRateMinorPerHour: p.rate,
            billingIncrementMinutes: p.increment,
            tax: { labourBp: p.labourBp, partsBp: p.partsBp },
            deposit: { percentBp: p.percentBp, atLeastParts: p.atLeastParts, processorMinimumMinor: p.minimum },
          };
          const e = priceEstimate(
            ls.map((l, i) => ({
              code: `line.${i}`,
              title: "line",
              minutes: l.minutes,
              quantity: l.quantity,
              covered: l.covered,
              parts: [{ code: `part.${i}`, title: "part", quantity: l.partQty, unitCostMinor: l.cost, markupBp: l.markupBp }],
            })),
            pol,
          );
          const t = e.totals;
          // Oracle: mathjs BigNumber — worked minutes rounded up once to the increment, then the money rounded once.
          const worked = ls.reduce((s, l) => s + (l.covered ? 0 : l.minutes * l.quantity), 0);
          const oracle = Number(exact.evaluate(`round(ceil(${worked} / ${p.increment}) * ${p.increment} * ${p.rate} / 60)`).toString());
          expect(t.labourMinor).toBe(oracle);
          expect(t.labourMinor).toBe(e.lines.reduce((s, l) => s + l.labourMinor, 0) + t.roundingLabourMinor);
          expect(t.roundingMinutes).toBeGreaterThanOrEqual(0);
          expect(t.roundingMinutes).toBeLessThan(p.increment);
          expect(t.partsMinor).toBe(e.lines.reduce((s, l) => s + l.partsMinor, 0));
          expect(t.taxMinor).toBe(t.labourTaxMinor + t.partsTaxMinor);
          expect(t.totalMinor).toBe(t.labourMinor + t.partsMinor + t.taxMinor);
          expect(t.depositMinor).toBeGreaterThanOrEqual(0);
          expect(t.depositMinor).toBeLessThanOrEqual(t.totalMinor);
          if (t.totalMinor > 0) expect(t.depositMinor).toBeGreaterThanOrEqual(Math.min(t.totalMinor, p.minimum));
          if (p.atLeastParts) expect(t.depositMinor).toBeGreaterThanOrEqual(Math.min(t.totalMinor, t.partsMinor));
          for (const v of Object.values(t)) if (typeof v === "number") expect(Number.isSafeInteger(v)).toBe(true);
        },
      ),
    );
  });
});

describe("billing increments", () => {
  // Fourteen 31-minute lines and one of 15: 449 minutes listed (worked by hand).
  const long: EstimateLineInput[] = [
    ...Array.from({ length: 14 }, (_, i) => ({ code: `work.${i}`, title: "Work", minutes: 31, quantity: 1 })),
    { code: "work.last", title: "Work", minutes: 15, quantity: 1 },
  ];

  test("by default 449 minutes are rounded once, to 450, not line by line to 645 (worked by hand: ⌈449/15⌉ × 15)", () => {
    const e = priceEstimate(long, policy);
    expect(e.totals.billingRounding).toBe("job");
    expect(e.totals.workedMinutes).toBe(449);
    expect(e.totals.billedMinutes).toBe(450);
    expect(e.totals.labourMinor).toBe(67_500); // 7.5 h × 90.00
    expect(billingNote(e.totals)).toBe(
      "Labour is billed as 450 minutes: the 449 minutes of work listed, rounded up once to the next 15 minutes.",
    );
  });

  test("a shop may choose per-line rounding: each 31 becomes 45, 14 × 45 + 15 = 645 minutes (worked by hand)", () => {
    const e = priceEstimate(long, { ...policy, billingRounding: "line" });
    expect(e.totals.billedMinutes).toBe(645);
    expect(e.lines[0].billedMinutes).toBe(45);
    expect(e.totals.roundingLabourMinor).toBe(0);
    expect(e.totals.labourMinor).toBe(96_750); // 10.75 h × 90.00
    expect(billingNote(e.totals)).toMatch(/^Labour is billed as 645 minutes: each line is rounded up to the next 15 minutes/);
  });

  test("covered lines add no billed minutes", () => {
    const e = priceEstimate([{ code: "a", title: "A", minutes: 40, quantity: 1, covered: true }, ...long.slice(0, 1)], policy);
    expect(e.totals.workedMinutes).toBe(31);
    expect(e.totals.billedMinutes).toBe(45);
  });

  test("the office setting is checked by the policy schema", () => {
    expect(shopPolicySchema.safeParse({ ...defaultShopPolicy, billingRounding: "line" }).success).toBe(true);
    expect(shopPolicySchema.safeParse({ ...defaultShopPolicy, billingRounding: "never" }).success).toBe(false);
  });
});

describe("money at the edges", () => {
  const oneLine = (minutes: number, parts: EstimateLineInput["parts"] = []): EstimateLineInput[] => [
    { code: "work", title: "Work", minutes, quantity: 1, parts },
  ];

  test("at the processor minimum: a total of exactly USD 0.50 is taken whole as the deposit (published: payment processor minimum 50)", () => {
    // 20 s of labour cannot be listed, so price a part: cost 0.37 at 35 % markup = 0.4995 → 0.50, no tax.
    const e = priceEstimate(oneLine(0, [{ code: "x", title: "X", quantity: 1, unitCostMinor: 37 }]), {
      ...policy,
      tax: { labourBp: 0, partsBp: 0 },
    });
    expect(e.totals.totalMinor).toBe(50);
    expect(e.totals.depositMinor).toBe(50);
    expect(e.totals.balanceMinor).toBe(0);
  });

  test("a zero-decimal currency: JPY 6,000 an hour, 449 minutes billed as 450 → ¥45,000; a ¥450 part at 35 % → ¥608 (worked by hand)", () => {
    const jpy: ShopPolicy = {
      ...policy,
      currency: { code: "JPY", exponent: 0 },
      labourRateMinorPerHour: toMinor("6000", 0),
      tax: { labourBp: 0, partsBp: 0 },
      deposit: { ...policy.deposit, processorMinimumMinor: 50 },
    };
    const e = priceEstimate(oneLine(449, [{ code: "x", title: "X", quantity: 1, unitCostMinor: toMinor("450", 0) }]), jpy);
    expect(e.totals.labourMinor).toBe(45_000);
    expect(e.totals.partsMinor).toBe(608); // 450 × 1.35 = 607.5, half up
    expect(e.totals.totalMinor).toBe(45_608);
    expect(formatMinor(e.totals.totalMinor, 0)).toBe("45608");
  });

  test("zero parts: no parts tax, and the deposit is the percentage of labour alone (worked by hand)", () => {
    const e = priceEstimate(oneLine(60), policy);
    expect(e.totals.partsMinor).toBe(0);
    expect(e.totals.partsTaxMinor).toBe(0);
    expect(e.totals.totalMinor).toBe(9000);
    expect(e.totals.depositMinor).toBe(2700); // 30 % of 90.00
  });

  test("very large quantities: 1,000 × 6,000 minutes is refused as above the processor's limit, naming the total (published: at most 8 digits)", () => {
    try {
      priceEstimate([{ code: "w", title: "W", minutes: 6000, quantity: 1000 }], policy);
      expect.unreachable();
    } catch (e) {
      expect((e as EngineError).code).toBe("amount-too-large");
      expect((e as EngineError).field).toBe("totals.labourMinor");
    }
    try {
      priceEstimate(oneLine(0, [{ code: "x", title: "X", quantity: 1000, unitCostMinor: MAX_AMOUNT_MINOR }]), policy);
      expect.unreachable();
    } catch (e) {
      expect((e as EngineError).field).toBe("totals.partsMinor");
    }
    // Just inside: 1,000 parts at 999.99 with no markup = 999,990.00 (99,999,000 minor units, 8 digits; worked by hand).
    const big = priceEstimate(oneLine(0, [{ code: "x", title: "X", quantity: 1000, unitCostMinor: 99_999, markupBp: 0 }]), {
      ...policy,
      tax: { labourBp: 0, partsBp: 0 },
    });
    expect(big.totals.totalMinor).toBe(99_999_000);
    expect(Number.isSafeInteger(big.totals.depositMinor)).toBe(true);
  });
});

describe("currency change", () => {
  const usd = { code: "USD", exponent: 2 };
  test("refused while a catalogue or an open estimate is priced in the old currency, with the reason", () => {
    const msg = currencyChangeRefusal(usd, { code: "JPY", exponent: 0 }, { catalogueParts: 11, openEstimates: 2 });
    expect(msg).toMatch(/stays USD: the parts catalogue \(11 parts\) and 2 open estimates are priced in USD/);
    expect(currencyChangeRefusal(usd, { code: "USD", exponent: 0 }, { catalogueParts: 0, openEstimates: 1 })).toMatch(
      /1 open estimate is priced/,
    );
  });
  test("allowed when nothing is priced yet, and no change is no question", () => {
    expect(currencyChangeRefusal(usd, { code: "JPY", exponent: 0 }, { catalogueParts: 0, openEstimates: 0 })).toBeNull();
    expect(currencyChangeRefusal(usd, usd, { catalogueParts: 11, openEstimates: 3 })).toBeNull();
  });
});
