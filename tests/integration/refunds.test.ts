import Papa from "papaparse";
import { PDFParse } from "pdf-parse";
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

// The two kinds of refund, as bookkeeping keeps them apart (common practice): money paid beyond the total goes
// back and leaves the price as it was; a goodwill allowance lowers the price and the money held together, so the
// customer's balance does not move. Figures computed by hand beside each check.
type OwnerView = {
  account: { owed: { minor: number }; owedBack: { minor: number }; reduced: { minor: number }; refunded: { minor: number } };
};

/** Hands the fixture job to Mira (a demo owner who can sign in) with the given approved total, in the given state. */
async function miraJob(jobId: string, totalMinor: number, state: string) {
  const [mira] = await sql<{ id: string }>(`select id from "user" where email = $1`, [DEMO.customer.email]);
  await sql(`update radio_set set owner_id = $1 where id = (select set_id from job where id = $2)`, [mira!.id, jobId]);
  await sql(`update job set customer_id = $1, state = $3 where id = $2`, [mira!.id, jobId, state]);
  await sql(`update estimate_revision set total_minor = $2, labour_minor = $2, deposit_minor = 0 where job_id = $1`, [jobId, totalMinor]);
}

async function settledRefund(refundId: string) {
  return waitFor(async () => {
    const r = await refundRow(refundId);
    return r.status === "succeeded" ? r : null;
  });
}

describe("a goodwill price reduction", () => {
  it("on a job paid in full leaves nothing owed either way, and the owner sees the reduction", async () => {
    const owner = await signedIn(DEMO.owner);
    // Total 120.00, paid 120.00: paid in full.
    const { paymentId, jobId, paymentIntentId } = await paidPaymentWithCharge(12_000);
    await miraJob(jobId, 12_000, "paid_in_full");
    const mira = await signedIn(DEMO.customer);
    const before = (await (await mira.get(`/api/portal/jobs/${jobId}`)).json()) as OwnerView;
    expect(before.account).toMatchObject({ owed: { minor: 0 }, owedBack: { minor: 0 }, reduced: { minor: 0 } });

    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, {
      amount: "20.00",
      reason: "Scratch on the cabinet top",
      kind: "reduction",
    });
    expect(res.status).toBe(202);
    const { refundId } = (await res.json()) as { refundId: string };
    await settledRefund(refundId);
    expect((await processorRefunds(paymentIntentId)).map((r) => r.amount)).toEqual([2000]);
    const [row] = await sql<{ kind: string }>(`select kind::text from refund where id = $1`, [refundId]);
    expect(row!.kind).toBe("reduction");
    const [audit] = await sql<{ after: { kind: string; amountMinor: number } }>(
      `select after from audit_event where action = 'refund.request' and entity_id = $1 and after->>'refundId' = $2`,
      [paymentId, refundId],
    );
    expect(audit!.after).toMatchObject({ kind: "reduction", amountMinor: 2000 });

    // Price 120.00 − 20.00 = 100.00; held 120.00 − 20.00 = 100.00: nothing to pay, nothing owed back.
    const after = (await (await mira.get(`/api/portal/jobs/${jobId}`)).json()) as OwnerView;
    expect(after.account).toMatchObject({
      owed: { minor: 0 },
      owedBack: { minor: 0 },
      reduced: { minor: 2000 },
      refunded: { minor: 2000 },
    });
    const page = await (await mira.get(`/portal/jobs/${jobId}`)).text();
    expect(page).toContain("Price reduced by");

    // The refund note says what it was.
    const note = await waitFor(
      async () => (await sql<{ id: string }>(`select id from money_document where refund_id = $1 and kind = 'refund'`, [refundId]))[0],
      { what: "the refund note" },
    );
    const pdf = new PDFParse({ data: new Uint8Array(await (await owner.get(`/api/documents/${note.id}/pdf`)).arrayBuffer()) });
    try {
      const text = (await pdf.getText()).text.replace(/\s+/g, " ");
      expect(text).toContain("Price reduction note");
      expect(text).toContain("not to be paid again");
    } finally {
      await pdf.destroy();
    }

    // payments.csv names the kind on the refund's row.
    const day = new Date().toISOString().slice(0, 10);
    const next = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
    const csv = Papa.parse<Record<string, string>>(
      await (await owner.get(`/api/office/exports/payments.csv?from=${day}&to=${next}`)).text(),
      {
        header: true,
        skipEmptyLines: true,
      },
    ).data;
    const [processorId] = await sql<{ id: string }>(`select processor_refund_id as id from refund where id = $1`, [refundId]);
    expect(csv.find((r) => r.reference === processorId!.id)).toMatchObject({ kind: "refund", refund_kind: "reduction", amount: "20.00" });
  });

  it("may not lower the price below zero, and says how far it may go", async () => {
    const owner = await signedIn(DEMO.owner);
    // Total 50.00 but 120.00 paid: 70.00 is money paid beyond the total; the price can be lowered by 50.00 at most.
    const { paymentId, jobId } = await paidPaymentWithCharge(12_000);
    await miraJob(jobId, 5000, "paid_in_full");
    const refused = await owner.post(`/api/office/payments/${paymentId}/refunds`, {
      amount: "60.00",
      reason: "Goodwill",
      kind: "reduction",
    });
    expect(refused.status).toBe(409);
    const body = (await refused.json()) as { error: { message: string; fields: Record<string, string> } };
    expect(body.error.fields.amount).toMatch(/^Amount: .*at most 50\.00/);
    expect((await sql(`select 1 from refund where payment_id = $1`, [paymentId])).length).toBe(0);
    // An unknown kind is refused naming the field.
    const bad = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "5.00", reason: "Goodwill", kind: "discount" });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { fields: Record<string, string> } }).error.fields.kind).toMatch(/^Kind: /);
  });
});

describe("a return of a duplicate charge", () => {
  it("gives back what was paid beyond the total, as before", async () => {
    const owner = await signedIn(DEMO.owner);
    // Total 25.00; paid 25.00 and again 25.00 (duplicate): 25.00 owed back before the refund.
    const { paymentId, jobId } = await duplicateCharge();
    await miraJob(jobId, 2500, "paid_in_full");
    const mira = await signedIn(DEMO.customer);
    const before = (await (await mira.get(`/api/portal/jobs/${jobId}`)).json()) as OwnerView;
    expect(before.account).toMatchObject({ owed: { minor: 0 }, owedBack: { minor: 2500 } });
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "25.00", reason: "Paid twice", kind: "return" });
    expect(res.status).toBe(202);
    const { refundId } = (await res.json()) as { refundId: string };
    await settledRefund(refundId);
    // Held 50.00 − 25.00 = 25.00 against a price of 25.00: settled, the price untouched.
    const after = (await (await mira.get(`/api/portal/jobs/${jobId}`)).json()) as OwnerView;
    expect(after.account).toMatchObject({ owed: { minor: 0 }, owedBack: { minor: 0 }, reduced: { minor: 0 }, refunded: { minor: 2500 } });
    const [row] = await sql<{ kind: string }>(`select kind::text from refund where id = $1`, [refundId]);
    expect(row!.kind).toBe("return");
  });
});
