import fc from "fast-check";
import { all, create } from "mathjs";
import { describe, expect, test } from "vitest";
import { EngineError } from "@/lib/engine/engine-error";
import {
  applyBasisPoints,
  checkAmount,
  computeBalance,
  computeDeposit,
  formatMinor,
  priceEstimate,
  roundHalfUpDiv,
  toMinor,
  type EstimateLineInput,
} from "@/lib/engine/pricing";
import { defaultShopPolicy, MAX_AMOUNT_MINOR, shopPolicySchema, type ShopPolicy } from "@/lib/engine/shop-policy";

const policy = defaultShopPolicy;

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

  // Oracle: mathjs in exact decimal (BigNumber) arithmetic, whose round() goes half away from zero.
  const exact = create(all, { number: "BigNumber", precision: 64 });

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

  test("labour rounds each line up to the billing increment at the hourly rate", () => {
    const e = priceEstimate(lines, policy);
    expect(e.lines[0].billedMinutes).toBe(30);
    expect(e.lines[0].labourMinor).toBe(4500);
    expect(e.lines[1].billedMinutes).toBe(30);
    expect(e.lines[2].billedMinutes).toBe(0);
  });

  test("parts carry markup; catalogue and custom parts", () => {
    const e = priceEstimate(lines, policy);
    // 450 × 1.35 = 607.5 → 608 per capacitor
    expect(e.lines[0].parts[0].unitPriceMinor).toBe(608);
    expect(e.lines[0].partsMinor).toBe(1824);
    expect(e.lines[2].partsMinor).toBe(1000);
  });

  test("separate tax rates for labour and parts", () => {
    const taxed: ShopPolicy = { ...policy, tax: { labourBp: 500, partsBp: 825 } };
    const e = priceEstimate(lines, taxed);
    expect(e.totals.labourTaxMinor).toBe(applyBasisPoints(e.totals.labourMinor, 500));
    expect(e.totals.partsTaxMinor).toBe(applyBasisPoints(e.totals.partsMinor, 825));
    expect(e.totals.totalMinor).toBe(e.totals.labourMinor + e.totals.partsMinor + e.totals.taxMinor);
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
          expect(t.labourMinor).toBe(e.lines.reduce((s, l) => s + l.labourMinor, 0));
          expect(t.partsMinor).toBe(e.lines.reduce((s, l) => s + l.partsMinor, 0));
          expect(t.taxMinor).toBe(t.labourTaxMinor + t.partsTaxMinor);
          expect(t.totalMinor).toBe(t.labourMinor + t.partsMinor + t.taxMinor);
          expect(t.depositMinor + t.balanceMinor).toBe(t.totalMinor);
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
