import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { accountOf, remainderBelowMinimum } from "@/lib/engine/pricing/account";
import { computeDeposit, depositToCollect } from "@/lib/engine/pricing/deposit";
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

describe("a remainder below the processor's minimum after the deposit", () => {
  test("a bench revision leaving a few cents to pay is waived, and the account then balances", () => {
    // Deposit of 30.00 paid; the revision at the bench totals 30.30: 0.30 is left, below the USD 0.50 minimum
    // (REFERENCES.md "Payments"), so it cannot be charged and is waived.
    const before = accountOf({ totalMinor: 3030, payments: [{ amountMinor: 3000, status: "paid" }], refunds: [] });
    expect(before.owedMinor).toBe(30);
    const waive = remainderBelowMinimum(before, MIN);
    expect(waive).toBe(30);
    const after = accountOf({ totalMinor: 3030, payments: [{ amountMinor: 3000, status: "paid" }], refunds: [], waivedMinor: waive });
    expect(after).toMatchObject({ owedMinor: 0, owedBackMinor: 0, waivedMinor: 30, heldMinor: 3000 });
  });

  test("at and above the minimum the remainder is chargeable and nothing is waived", () => {
    // USD 0.50 is the smallest charge the processor accepts (REFERENCES.md "Payments"): 0.50 can be paid, 0.49 cannot.
    const at = accountOf({ totalMinor: 3050, payments: [{ amountMinor: 3000, status: "paid" }], refunds: [] });
    expect(remainderBelowMinimum(at, MIN)).toBe(0);
    const below = accountOf({ totalMinor: 3049, payments: [{ amountMinor: 3000, status: "paid" }], refunds: [] });
    expect(remainderBelowMinimum(below, MIN)).toBe(49);
    const nothing = accountOf({ totalMinor: 3000, payments: [{ amountMinor: 3000, status: "paid" }], refunds: [] });
    expect(remainderBelowMinimum(nothing, MIN)).toBe(0);
  });

  test("in a zero-decimal currency the minimum is in whole units", () => {
    // JPY has no minor unit: ¥12,030 is 12030 (REFERENCES.md "Payments": JPY 500 → 500). The processor's
    // smallest JPY charge is ¥50 (from memory of the processor's published minimum-charge table).
    const jpyMin = 50;
    const a = accountOf({ totalMinor: 12_030, payments: [{ amountMinor: 12_000, status: "paid" }], refunds: [] });
    expect(remainderBelowMinimum(a, jpyMin)).toBe(30);
    const b = accountOf({ totalMinor: 12_050, payments: [{ amountMinor: 12_000, status: "paid" }], refunds: [] });
    expect(remainderBelowMinimum(b, jpyMin)).toBe(0);
  });

  test("a refund after the waiver is counted once: the waiver is not given back again", () => {
    // 30.00 deposit and a duplicate 30.00 charge held; total 30.30 with 0.30 waived. The duplicate is owed back
    // in full (30.00, simple subtraction, common practice); once refunded, nothing is owed either way.
    const payments = [
      { amountMinor: 3000, status: "paid" },
      { amountMinor: 3000, status: "duplicate" },
    ];
    const held = accountOf({ totalMinor: 3030, payments, refunds: [], waivedMinor: 30 });
    expect(held).toMatchObject({ owedMinor: 0, owedBackMinor: 3000 });
    const refunded = accountOf({ totalMinor: 3030, payments, refunds: [{ amountMinor: 3000, status: "succeeded" }], waivedMinor: 30 });
    expect(refunded).toMatchObject({ owedMinor: 0, owedBackMinor: 0 });
  });

  test("for any account, a waiver leaves nothing owed below the minimum and never turns into money owed back", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 1_000_000 }),
        fc.array(fc.integer({ min: 1, max: 500_000 }), { maxLength: 3 }),
        fc.integer({ min: 0, max: 5_000 }),
        (total, paid, minimum) => {
          const payments = paid.map((amountMinor) => ({ amountMinor, status: "paid" }));
          const before = accountOf({ totalMinor: total, payments, refunds: [] });
          const waive = remainderBelowMinimum(before, minimum);
          const after = accountOf({ totalMinor: total, payments, refunds: [], waivedMinor: waive });
          // Never more than the minimum less one unit, never more than was owed.
          expect(waive).toBeLessThanOrEqual(Math.max(0, minimum - 1));
          expect(waive).toBeLessThanOrEqual(before.owedMinor);
          // What is left to pay is nothing or chargeable; nothing extra is owed back because of a waiver.
          expect(after.owedMinor === 0 || after.owedMinor >= minimum).toBe(true);
          expect(after.owedBackMinor).toBe(before.owedBackMinor);
          // Money never loses a cent: paid = total − waived − owed + owed back (REFERENCES.md oracles, fast-check).
          const sumPaid = paid.reduce((s, p) => s + p, 0);
          expect(sumPaid).toBe(total - after.waivedMinor - after.owedMinor + after.owedBackMinor);
        },
      ),
    );
  });

  test("a deposit difference below the minimum is not asked for; it joins the balance", () => {
    // A revision's deposit of 30.20 with 30.00 already paid: 0.20 cannot be charged (USD 0.50 minimum,
    // REFERENCES.md "Payments"); 31.00 leaves 1.00, which can.
    expect(depositToCollect({ depositMinor: 3020, paidDepositsMinor: 3000, owedMinor: 7000 }, MIN)).toBe(0);
    expect(depositToCollect({ depositMinor: 3100, paidDepositsMinor: 3000, owedMinor: 7000 }, MIN)).toBe(100);
    // Never more than is owed.
    expect(depositToCollect({ depositMinor: 3100, paidDepositsMinor: 0, owedMinor: 2000 }, MIN)).toBe(2000);
    expect(depositToCollect({ depositMinor: 3000, paidDepositsMinor: 3000, owedMinor: 7000 }, MIN)).toBe(0);
  });
});
