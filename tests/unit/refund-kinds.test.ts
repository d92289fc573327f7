import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { accountOf, type AccountPayment, type AccountRefund } from "@/lib/engine/pricing/account";

// Two kinds of money going back, as bookkeeping keeps them apart (common practice): a refund of an
// over-payment returns cash the shop should not hold and leaves the price as it was; a price reduction
// (an allowance granted after the sale) lowers the price and the cash together, so the customer's balance
// does not move. The worked examples below are computed by hand in minor units (cents).

const paid = (amountMinor: number, status = "paid"): AccountPayment => ({ amountMinor, status });
const reduction = (amountMinor: number, status = "succeeded"): AccountRefund => ({ amountMinor, status, kind: "reduction" });
const giveBack = (amountMinor: number, status = "succeeded"): AccountRefund => ({ amountMinor, status, kind: "return" });

describe("a reduction lowers the price and the money held together", () => {
  test("total 120.00, paid 120.00, goodwill reduction 20.00: nothing owed either way", () => {
    // Price 120.00 − 20.00 = 100.00; held 120.00 − 20.00 = 100.00; 100.00 − 100.00 = 0 both ways.
    const a = accountOf({ totalMinor: 12_000, payments: [paid(12_000)], refunds: [reduction(2000)] });
    expect(a).toMatchObject({ reducedMinor: 2000, heldMinor: 10_000, refundedMinor: 2000, owedMinor: 0, owedBackMinor: 0 });
  });

  test("the same 20.00 given back as a return leaves 20.00 to pay, as it always did", () => {
    // Price stays 120.00; held 100.00; owed 20.00. A return is for money held beyond the total.
    const a = accountOf({ totalMinor: 12_000, payments: [paid(12_000)], refunds: [giveBack(2000)] });
    expect(a).toMatchObject({ reducedMinor: 0, owedMinor: 2000, owedBackMinor: 0 });
    // A refund row without a kind (written before kinds existed) is a return.
    expect(
      accountOf({ totalMinor: 12_000, payments: [paid(12_000)], refunds: [{ amountMinor: 2000, status: "succeeded" }] }).owedMinor,
    ).toBe(2000);
  });

  test("total 120.00, paid 120.00 plus a duplicate charge of 30.00, reduction 10.00: 30.00 owed back", () => {
    // Held 120.00 + 30.00 − 10.00 = 140.00; price 120.00 − 10.00 = 110.00; 140.00 − 110.00 = 30.00 owed back.
    const a = accountOf({ totalMinor: 12_000, payments: [paid(12_000), paid(3000, "duplicate")], refunds: [reduction(1000)] });
    expect(a).toMatchObject({ reducedMinor: 1000, heldMinor: 14_000, owedMinor: 0, owedBackMinor: 3000 });
  });

  test("a reduction on its way counts at once; a failed one counts for nothing", () => {
    // Total 120.00, deposit 50.00 paid, reduction 20.00 asked: price 100.00, held 30.00, still to pay 70.00,
    // the same 70.00 as before the reduction.
    const asked = accountOf({ totalMinor: 12_000, payments: [paid(5000)], refunds: [reduction(2000, "pending")] });
    expect(asked).toMatchObject({ reducedMinor: 2000, refundPendingMinor: 2000, heldMinor: 3000, owedMinor: 7000 });
    const requested = accountOf({ totalMinor: 12_000, payments: [paid(5000)], refunds: [reduction(2000, "requested")] });
    expect(requested.owedMinor).toBe(7000);
    // The processor refused it: nothing went back and the price stands at 120.00; 120.00 paid, nothing owed.
    const failed = accountOf({ totalMinor: 12_000, payments: [paid(12_000)], refunds: [reduction(2000, "failed")] });
    expect(failed).toMatchObject({ reducedMinor: 0, refundedMinor: 0, heldMinor: 12_000, owedMinor: 0, owedBackMinor: 0 });
  });

  test("a reduction counts after a waiver and never takes the price below zero", () => {
    // Total 30.30 with 0.30 waived: 30.00 due; paid 30.00; reduction 5.00 → price 25.00, held 25.00, nothing owed.
    const waived = accountOf({ totalMinor: 3030, payments: [paid(3000)], refunds: [reduction(500)], waivedMinor: 30 });
    expect(waived).toMatchObject({ reducedMinor: 500, owedMinor: 0, owedBackMinor: 0 });
    // Total 10.00, paid 10.00 and a duplicate 10.00, reduction 15.00: the price stops at 0 (reduced 10.00), the
    // other 5.00 came out of the duplicate; held 20.00 − 15.00 = 5.00, all of it owed back.
    const beyond = accountOf({ totalMinor: 1000, payments: [paid(1000), paid(1000, "duplicate")], refunds: [reduction(1500)] });
    expect(beyond).toMatchObject({ reducedMinor: 1000, heldMinor: 500, owedMinor: 0, owedBackMinor: 500 });
  });
});

// Random jobs: a total, a few payments, earlier refunds of either kind that together never exceed what was paid
// (the refund form refuses more than is left on a payment).
const STATUSES = ["succeeded", "requested", "pending", "failed"] as const;
const job = fc
  .record({
    total: fc.integer({ min: 0, max: 1_000_000 }),
    waived: fc.integer({ min: 0, max: 49 }),
    payments: fc.array(
      fc.record({ amountMinor: fc.integer({ min: 1, max: 500_000 }), status: fc.constantFrom("paid", "duplicate", "failed") }),
      {
        maxLength: 4,
      },
    ),
    refunds: fc.array(
      fc.record({
        share: fc.double({ min: 0, max: 1, noNaN: true }),
        status: fc.constantFrom(...STATUSES),
        kind: fc.constantFrom("return", "reduction"),
      }),
      { maxLength: 4 },
    ),
    extra: fc.double({ min: 0, max: 1, noNaN: true }),
  })
  .map(({ total, waived, payments, refunds, extra }) => {
    let left = payments.filter((p) => p.status !== "failed").reduce((s, p) => s + p.amountMinor, 0);
    const rs: AccountRefund[] = [];
    for (const r of refunds) {
      const amountMinor = Math.floor(left * r.share);
      if (amountMinor <= 0) continue;
      rs.push({ amountMinor, status: r.status, kind: r.kind });
      if (r.status !== "failed") left -= amountMinor;
    }
    return { total, waived, payments, refunds: rs, leftToRefund: left, extra };
  });

describe("properties of the account with both kinds", () => {
  test("a reduction never makes anything owed that was not owed before, nor more owed back", () => {
    fc.assert(
      fc.property(job, fc.constantFrom("succeeded", "requested", "pending"), (j, status) => {
        const before = accountOf({ totalMinor: j.total, payments: j.payments, refunds: j.refunds, waivedMinor: j.waived });
        const amount = Math.floor(j.leftToRefund * j.extra);
        fc.pre(amount > 0);
        const after = accountOf({
          totalMinor: j.total,
          payments: j.payments,
          refunds: [...j.refunds, reduction(amount, status)],
          waivedMinor: j.waived,
        });
        expect(after.owedMinor).toBeLessThanOrEqual(before.owedMinor);
        expect(after.owedBackMinor).toBeLessThanOrEqual(before.owedBackMinor);
        // Within what is left of the price, a reduction settles itself: neither figure moves at all.
        if (amount <= before.totalMinor - before.waivedMinor - before.reducedMinor) {
          expect(after.owedMinor).toBe(before.owedMinor);
          expect(after.owedBackMinor).toBe(before.owedBackMinor);
        }
      }),
    );
  });

  test("owed and owed back are never both positive, and a failed refund of either kind changes nothing", () => {
    fc.assert(
      fc.property(job, fc.constantFrom("return", "reduction"), (j, kind) => {
        const a = accountOf({ totalMinor: j.total, payments: j.payments, refunds: j.refunds, waivedMinor: j.waived });
        expect(a.owedMinor === 0 || a.owedBackMinor === 0).toBe(true);
        expect(a.owedMinor).toBeGreaterThanOrEqual(0);
        expect(a.owedBackMinor).toBeGreaterThanOrEqual(0);
        expect(a.reducedMinor).toBeLessThanOrEqual(a.totalMinor - a.waivedMinor);
        const withFailed = accountOf({
          totalMinor: j.total,
          payments: j.payments,
          refunds: [...j.refunds, { amountMinor: 1 + j.total, status: "failed", kind }],
          waivedMinor: j.waived,
        });
        expect(withFailed).toEqual(a);
      }),
    );
  });

  test("a reduction of what the owner paid on a job paid exactly leaves nothing owed, where a return leaves it all owed", () => {
    // Paid exactly the total, then r goes back: a reduction means the price was r lower (nothing owed);
    // a return means the money is still due (r owed), the behaviour every existing refund keeps.
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1_000_000 }), fc.double({ min: 0, max: 1, noNaN: true }), (total, share) => {
        const r = Math.max(1, Math.floor(total * share));
        const reduced = accountOf({ totalMinor: total, payments: [paid(total)], refunds: [reduction(r)] });
        const returned = accountOf({ totalMinor: total, payments: [paid(total)], refunds: [giveBack(r)] });
        expect(reduced).toMatchObject({ owedMinor: 0, owedBackMinor: 0, reducedMinor: r });
        expect(returned).toMatchObject({ owedMinor: r, owedBackMinor: 0, reducedMinor: 0 });
      }),
    );
  });
});
