import { afterAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import {
  deliverHeldEvents,
  duplicateCharge,
  loseNextProcessorReplies,
  paidPaymentWithCharge,
  processorRefunds,
  waitFor,
} from "./office-fixtures";

// Refunds whose answer is lost. The processor's contract (Stripe API docs, "Idempotent requests"): a request
// repeated with the same idempotency key returns the first result instead of acting twice, and a refund can be
// read back by its id or listed by payment intent. The stand-in keeps that contract; a "lost reply" makes the
// refund but never answers, as when the network drops the answer.

afterAll(async () => {
  await closeTestPool();
});

type Detail = { refundedMinor: number; inFlightMinor: number; refunds: { id: string; status: string }[] };

async function refundRow(refundId: string) {
  const [row] = await sql<{ status: string; processor_refund_id: string | null; refunded: number }>(
    `select r.status, r.processor_refund_id, p.refunded_minor as refunded from refund r join payment p on p.id = r.payment_id where r.id = $1`,
    [refundId],
  );
  return row!;
}

describe("a refund whose answer is lost", () => {
  it("is pending, shown in the office, and reading it back settles it without refunding twice", async () => {
    const owner = await signedIn(DEMO.owner);
    const { paymentId, paymentIntentId } = await paidPaymentWithCharge(9000);
    // Both the call and the SDK's own retry (same key) are made at the processor and never answered.
    await loseNextProcessorReplies(paymentIntentId, 2, { holdEvents: true });
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "30.00", reason: "Knob set not as described" });
    expect(res.status).toBe(202);
    const { refundId, status } = (await res.json()) as { refundId: string; status: string };
    expect(status).toBe("pending");
    expect((await refundRow(refundId)).status).toBe("pending");
    // The processor did make it, exactly once, although it was asked twice.
    expect((await processorRefunds(paymentIntentId)).map((r) => r.amount)).toEqual([3000]);

    const detail = (await (await owner.get(`/api/office/payments/${paymentId}`)).json()) as Detail;
    expect(detail).toMatchObject({ refundedMinor: 0, inFlightMinor: 3000 });
    expect(detail.refunds.map((r) => r.status)).toEqual(["pending"]);
    const overview = await (await owner.get("/office")).text();
    expect(overview).toContain("Pending — outcome not known yet");

    const check = await owner.post(`/api/office/refunds/${refundId}/check`);
    expect(check.status).toBe(200);
    expect(((await check.json()) as { status: string }).status).toBe("succeeded");
    const settled = await refundRow(refundId);
    expect(settled.status).toBe("succeeded");
    expect(settled.processor_refund_id).toMatch(/^re_/);
    expect(settled.refunded).toBe(3000);

    // The webhooks arrive late: nothing is counted twice, and the processor still holds one refund.
    expect(await deliverHeldEvents("charge.refunded", paymentIntentId)).toBe(1);
    await deliverHeldEvents("refund.created", paymentIntentId);
    await waitFor(async () => {
      const [e] = await sql<{ n: number }>(
        `select count(*)::int as n from payment_event where type = 'charge.refunded' and payment_id = $1`,
        [paymentId],
      );
      return e!.n === 1;
    });
    expect((await refundRow(refundId)).refunded).toBe(3000);
    expect((await processorRefunds(paymentIntentId)).length).toBe(1);
    expect((await owner.post(`/api/office/refunds/${refundId}/check`)).status).toBe(200);
    expect((await processorRefunds(paymentIntentId)).length).toBe(1);
  });

  it("is settled by the processor's webhook when it arrives", async () => {
    const owner = await signedIn(DEMO.owner);
    const { paymentId, paymentIntentId } = await paidPaymentWithCharge(6000);
    await loseNextProcessorReplies(paymentIntentId, 2, { holdEvents: true });
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "60.00", reason: "Set could not be repaired" });
    const { refundId } = (await res.json()) as { refundId: string };
    expect((await refundRow(refundId)).status).toBe("pending");
    // Nothing is left to refund while the whole amount is pending.
    const more = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "0.01", reason: "One more cent" });
    expect(more.status).toBe(409);

    expect(await deliverHeldEvents("refund.created", paymentIntentId)).toBe(1);
    const settled = await waitFor(async () => {
      const r = await refundRow(refundId);
      return r.status === "succeeded" ? r : null;
    });
    // The refund row and the payment's refunded figure are settled together.
    expect(settled.refunded).toBe(6000);
    const audits = await sql<{ action: string }>(`select action from audit_event where entity = 'refund' and entity_id = $1 order by id`, [
      refundId,
    ]);
    expect(audits.map((a) => a.action)).toEqual(["refund.pending", "refund.succeeded"]);
  });
});

describe("a duplicate charge", () => {
  it("is recorded as owed back and can be refunded from the office", async () => {
    const owner = await signedIn(DEMO.owner);
    const { paymentId, firstPaymentId, paymentIntentId } = await duplicateCharge();
    const list = (await (await owner.get("/api/office/payments?status=paid")).json()) as { rows: { id: string; status: string }[] };
    expect(list.rows.find((r) => r.id === paymentId)?.status).toBe("duplicate");
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, {
      amount: "25.00",
      reason: "Paid twice for the same deposit",
    });
    expect(res.status).toBe(202);
    const { refundId } = (await res.json()) as { refundId: string };
    const settled = await waitFor(async () => {
      const r = await refundRow(refundId);
      return r.status === "succeeded" ? r : null;
    });
    expect(settled.refunded).toBe(2500);
    expect((await processorRefunds(paymentIntentId)).map((r) => r.amount)).toEqual([2500]);
    // The first, good payment is untouched.
    const [first] = await sql<{ status: string; refunded_minor: number }>(`select status, refunded_minor from payment where id = $1`, [
      firstPaymentId,
    ]);
    expect(first).toEqual({ status: "paid", refunded_minor: 0 });
  });
});
