import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { accountOf } from "@/lib/engine/pricing/account";
import { computeDeposit } from "@/lib/engine/pricing/deposit";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";

// The processor refuses a charge below its minimum: USD 0.50, i.e. 50 minor units (published: Stripe API
// documentation, REFERENCES.md "Payments"). Neither the deposit nor the balance may be a positive amount below it.
const MIN = 50;
const deposit = { ...defaultShopPolicy.deposit, percentBp: 3000, atLeastParts: false, processorMinimumMinor: MIN };

describe("the processor's minimum charge", () => {
  test("a balance that would be below the minimum is folded into the deposit", () => {
    // Total USD 0.70: 30 % is 0.21, raised to the 0.50 minimum, which would leave a balance of 0.20 (uncollectable).
    expect(computeDeposit({ totalMinor: 70, partsMinor: 0 }, deposit)).toBe(70);
    // Total USD 0.99: deposit 0.50 leaves 0.49, still below the minimum: all of it up front.
    expect(computeDeposit({ totalMinor: 99, partsMinor: 0 }, deposit)).toBe(99);
    // Total USD 1.00: deposit 0.50 and balance 0.50 are both chargeable.
    expect(computeDeposit({ totalMinor: 100, partsMinor: 0 }, deposit)).toBe(50);
  });

  test("a part price that leaves a few cents of labour does not leave a balance under the minimum", () => {
    // Parts 10.00 of a 10.30 total with "at least the parts": the 0.30 left goes into the deposit.
    expect(computeDeposit({ totalMinor: 1030, partsMinor: 1000 }, { ...deposit, atLeastParts: true })).toBe(1030);
  });

  test("for any total, neither part is a positive amount under the minimum unless the whole total is", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000 }), fc.integer({ min: 0, max: 10_000 }), (total, percentBp) => {
        const d = computeDeposit({ totalMinor: total, partsMinor: 0 }, { ...deposit, percentBp });
        const balance = total - d;
        expect(d).toBeGreaterThanOrEqual(0);
        expect(balance).toBeGreaterThanOrEqual(0);
        if (total >= MIN) expect(d === 0 || d >= MIN).toBe(true);
        expect(balance === 0 || balance >= MIN).toBe(true);
      }),
    );
  });

  test("a cheaper revision after a payment shows the amount owed back, not a balance of zero", () => {
    // Deposit of 93.72 paid; the revised total is 40.00: 53.72 is owed back (simple subtraction, common practice).
    const a = accountOf({ totalMinor: 4000, payments: [{ amountMinor: 9372, status: "paid" }], refunds: [] });
    expect(a.owedMinor).toBe(0);
    expect(a.owedBackMinor).toBe(5372);
  });
});
