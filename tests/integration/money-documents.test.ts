import { randomUUID } from "node:crypto";
import { PDFParse } from "pdf-parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { seedJobWithEstimate, type SeededJob } from "../fixtures/jobs";
import { seriesGaps } from "@/lib/engine/documents/numbering";
import { paidPaymentWithCharge, waitFor } from "./office-fixtures";

// Receipts, refund notes, invoices and the printable estimate; cash and cheques recorded by the office.

afterAll(async () => {
  await closeTestPool();
});

let owner: TestClient;
beforeAll(async () => {
  owner = await signedIn(DEMO.owner);
});

async function pdfText(res: Response): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, " ");
  } finally {
    await parser.destroy();
  }
}

/** A job of a new set owner, its estimate approved, in the given state (balance due: the set is ready). */
async function jobOwing(state = "balance_due", totalMinor = 31240): Promise<{ job: SeededJob; client: TestClient; label: string }> {
  const { client, email } = await newCustomer("counter");
  const job = await seedJobWithEstimate({ email, state, totalMinor });
  await sql("update estimate_revision set status = 'approved', decided_at = now() where id = $1", [job.revisionId]);
  return { job, client, label: `KL-${String(job.number).padStart(4, "0")}` };
}

function cash(job: string, amount: string, extra: Record<string, unknown> = {}) {
  return {
    job,
    amount,
    method: "cash",
    // A past day: never later than the shop's today, whatever its zone.
    receivedOn: "2026-01-15",
    idempotencyKey: randomUUID(),
    ...extra,
  };
}

async function stateOf(jobId: string): Promise<string> {
  const [row] = await sql<{ state: string }>("select state::text as state from job where id = $1", [jobId]);
  return row!.state;
}

async function receiptsThisYear(): Promise<number[]> {
  const rows = await sql<{ sequence: number }>(
    "select sequence from money_document where kind = 'receipt' and year = (select max(year) from money_document where kind = 'receipt')",
  );
  return rows.map((r) => r.sequence);
}

describe("cash and cheques at the counter", () => {
  it("a cash payment of the whole balance moves the job to paid in full, with a receipt and an invoice", async () => {
    const { job, client, label } = await jobOwing();
    // The estimate's total 312.40 is owed in full (nothing paid yet): typed as on a price tag.
    const res = await owner.post("/api/office/payments/manual", cash(label, "312.40"));
    expect(res.status).toBe(201);
    const body = (await res.json()) as { receiptId: string; receiptNumber: string; jobState: string; paymentId: string };
    expect(body.jobState).toBe("paid_in_full");
    expect(await stateOf(job.jobId)).toBe("paid_in_full");
    expect(body.receiptNumber).toMatch(/^RCT-\d{4}-\d{4,}$/);
    const [row] = await sql<{ amount_minor: number; method: string; created_by: string; status: string }>(
      "select amount_minor, method::text as method, created_by, status::text as status from payment where id = $1",
      [body.paymentId],
    );
    expect(row).toMatchObject({ amount_minor: 31240, method: "cash", status: "paid" });
    const [audit] = await sql<{ n: number }>(
      "select count(*)::int as n from audit_event where action = 'payment.manual' and entity_id = $1",
      [body.paymentId],
    );
    expect(audit!.n).toBe(1);
    const invoices = await sql<{ number: string }>("select number from money_document where job_id = $1 and kind = 'invoice'", [job.jobId]);
    expect(invoices).toHaveLength(1);
    expect(invoices[0]!.number).toMatch(/^INV-\d{4}-\d{4,}$/);

    // The owner downloads the receipt: its amount is the database's, in the shop's money format.
    const pdf = await client.get(`/api/documents/${body.receiptId}/pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    const text = await pdfText(pdf);
    expect(text).toContain(body.receiptNumber);
    expect(text).toContain(`$${(row!.amount_minor / 100).toFixed(2)}`);
    expect(text).toMatch(/Method Cash/i); // the PDF prints its labels in capitals
    expect(text).toContain(label);
    expect(text).toMatch(/Ship to/i);

    // The office finds the invoice and the receipt on the job's bench page too; a technician, who may not
    // download them, is not offered the links.
    const [invoiceRow] = await sql<{ id: string }>("select id from money_document where job_id = $1 and kind = 'invoice'", [job.jobId]);
    const officePage = await (await owner.get(`/bench/jobs/${job.jobId}`)).text();
    expect(officePage).toContain(`/api/documents/${invoiceRow!.id}/pdf`);
    expect(officePage).toContain(`/api/documents/${body.receiptId}/pdf`);
    const tech = await signedIn(DEMO.tech);
    const techPage = await (await tech.get(`/bench/jobs/${job.jobId}`)).text();
    expect(techPage).not.toContain("/api/documents/");
  });

  it("takes part of a balance, then the rest; refuses zero, more than owed, and a job owing nothing", async () => {
    const { job, label } = await jobOwing();
    const zero = await owner.post("/api/office/payments/manual", cash(label, "0.00"));
    expect(zero.status).toBe(400);
    expect(((await zero.json()) as { error: { fields: Record<string, string> } }).error.fields.amount).toMatch(/^Amount: /);
    const over = await owner.post("/api/office/payments/manual", cash(label, "312.41"));
    expect(over.status).toBe(400);
    expect(((await over.json()) as { error: { fields: Record<string, string> } }).error.fields.amount).toMatch(/\$312\.40 is owed/);
    const part = await owner.post("/api/office/payments/manual", cash(label, "100.00", { method: "cheque", chequeNumber: "004417" }));
    expect(part.status).toBe(201);
    expect(await stateOf(job.jobId)).toBe("balance_due");
    // 312.40 − 100.00 = 212.40 left: one cent more is refused, the exact rest is taken.
    const tooMuch = await owner.post("/api/office/payments/manual", cash(label, "212.41"));
    expect(((await tooMuch.json()) as { error: { fields: Record<string, string> } }).error.fields.amount).toMatch(/\$212\.40 is owed/);
    const rest = await owner.post("/api/office/payments/manual", cash(label, "212.40"));
    expect(rest.status).toBe(201);
    expect(await stateOf(job.jobId)).toBe("paid_in_full");
    const after = await owner.post("/api/office/payments/manual", cash(label, "1.00"));
    expect(after.status).toBe(409);
    expect(((await after.json()) as { error: { message: string } }).error.message).toMatch(/Nothing is owed/);

    const notYet = await jobOwing("estimate_sent");
    const early = await owner.post("/api/office/payments/manual", cash(notYet.label, "10.00"));
    expect(early.status).toBe(409);
    const future = await owner.post("/api/office/payments/manual", cash(notYet.label, "10.00", { receivedOn: "2999-01-01" }));
    expect(future.status).toBeGreaterThanOrEqual(400);
  });

  it("a double submit of one form records one payment", async () => {
    const { job, label } = await jobOwing();
    const values = cash(label, "50.00");
    const [a, b] = await Promise.all([
      owner.post("/api/office/payments/manual", values),
      owner.post("/api/office/payments/manual", values),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 201]);
    const [ja, jb] = (await Promise.all([a.json(), b.json()])) as { paymentId: string; receiptNumber: string }[];
    expect(ja!.paymentId).toBe(jb!.paymentId);
    expect(ja!.receiptNumber).toBe(jb!.receiptNumber);
    const rows = await sql("select id from payment where job_id = $1", [job.jobId]);
    expect(rows).toHaveLength(1);
  });

  it("numbers receipts without gaps or repeats, even for two payments at once and after a refused one", async () => {
    const [x, y] = await Promise.all([jobOwing(), jobOwing()]);
    const before = await receiptsThisYear();
    const [a, b] = await Promise.all([
      owner.post("/api/office/payments/manual", cash(x.label, "312.40")),
      owner.post("/api/office/payments/manual", cash(y.label, "312.40")),
    ]);
    expect([a.status, b.status]).toEqual([201, 201]);
    const [ja, jb] = (await Promise.all([a.json(), b.json()])) as { receiptNumber: string }[];
    expect(ja!.receiptNumber).not.toBe(jb!.receiptNumber);
    const after = await receiptsThisYear();
    expect(after).toHaveLength(before.length + 2);
    expect(new Set(after).size).toBe(after.length);
    expect(seriesGaps(after)).toEqual([]);
    // A refused payment rolls back before numbering; the next receipt takes the very next number.
    const z = await jobOwing();
    expect((await owner.post("/api/office/payments/manual", cash(z.label, "999.00"))).status).toBe(400);
    const next = (await (await owner.post("/api/office/payments/manual", cash(z.label, "10.00"))).json()) as { receiptNumber: string };
    expect(Number(next.receiptNumber.split("-")[2])).toBe(Math.max(...after) + 1);
    // The invoices issued with those payments form their own gapless series.
    const invoices = await sql<{ sequence: number }>(
      "select sequence from money_document where kind = 'invoice' and year = (select max(year) from money_document where kind = 'invoice')",
    );
    expect(seriesGaps(invoices.map((r) => r.sequence))).toEqual([]);
  });

  it("voids a mistaken entry: it stops counting, stays on record, and its receipt says VOID", async () => {
    const { job, client, label } = await jobOwing();
    const res = (await (await owner.post("/api/office/payments/manual", cash(label, "80.00"))).json()) as {
      paymentId: string;
      receiptId: string;
    };
    const bad = await owner.post(`/api/office/payments/${res.paymentId}/void`, { reason: "" });
    expect(bad.status).toBe(400);
    const ok = await owner.post(`/api/office/payments/${res.paymentId}/void`, { reason: "Typed on the wrong job" });
    expect(ok.status).toBe(200);
    const [row] = await sql<{ status: string; voided_by: string | null }>(
      "select status::text as status, voided_by from payment where id = $1",
      [res.paymentId],
    );
    expect(row!.status).toBe("voided");
    expect(row!.voided_by).not.toBeNull();
    // The whole 312.40 is owed again.
    const again = await owner.post("/api/office/payments/manual", cash(label, "312.41"));
    expect(((await again.json()) as { error: { fields: Record<string, string> } }).error.fields.amount).toMatch(/\$312\.40 is owed/);
    expect(await pdfText(await client.get(`/api/documents/${res.receiptId}/pdf`))).toMatch(/VOID/);
    expect(await stateOf(job.jobId)).toBe("balance_due");
  });

  it("lists manual payments with their method and receipt in the payments export", async () => {
    const { label } = await jobOwing();
    const r = (await (
      await owner.post("/api/office/payments/manual", cash(label, "25.00", { method: "cheque", chequeNumber: "881" }))
    ).json()) as {
      receiptNumber: string;
    };
    const day = new Date().toISOString().slice(0, 10);
    const csv = await (await owner.get(`/api/office/exports/payments.csv?from=${day}&to=${day}`)).text();
    const line = csv.split("\r\n").find((l) => l.includes(r.receiptNumber));
    expect(line).toBeDefined();
    expect(line).toContain(",cheque,");
    expect(line).toContain(",881,");
    expect(csv.split("\r\n")[0]).toContain("method");
  });
});

describe("invoice and estimate", () => {
  it("prints tax per kind at the shop's rates (hand-worked) and the shop's tax number when set", async () => {
    const { job, client, label } = await jobOwing();
    // Hand-worked: labour $200.00 at 5% = $10.00; parts $48.60 at 8% = $3.888, rounded half up to $3.89;
    // total 200.00 + 48.60 + 10.00 + 3.89 = $262.49.
    await sql(
      `update estimate_revision set labour_minor = 20000, parts_minor = 4860, tax_minor = 1389, total_minor = 26249, deposit_minor = 7875,
         pricing = pricing || '{"labourTaxMinor": 1000, "partsTaxMinor": 389, "tax": {"labourBp": 500, "partsBp": 800}}'::jsonb where id = $1`,
      [job.revisionId],
    );
    // The tax number setting is checked, then printed.
    const snap = (await (await owner.get("/api/office/settings")).json()) as {
      version: number;
      values: { identity: Record<string, string> };
    };
    const values = structuredClone(snap.values);
    values.identity.taxNumber = "no<tags>";
    const refused = await owner.request("/api/office/settings", { method: "PUT", json: { ...values, version: snap.version } });
    expect(refused.status).toBe(400);
    expect(((await refused.json()) as { error: { fields: Record<string, string> } }).error.fields["identity.taxNumber"]).toMatch(
      /^Tax number: /,
    );
    values.identity.taxNumber = "PA-44-019283";
    expect((await owner.request("/api/office/settings", { method: "PUT", json: { ...values, version: snap.version } })).status).toBe(200);

    expect((await owner.post("/api/office/payments/manual", cash(label, "262.49"))).status).toBe(201);
    const [invoice] = await sql<{ id: string; number: string }>(
      "select id, number from money_document where job_id = $1 and kind = 'invoice'",
      [job.jobId],
    );
    const text = await pdfText(await client.get(`/api/documents/${invoice!.id}/pdf`));
    expect(text).toContain(invoice!.number);
    expect(text).toMatch(/Tax on labour at 5% \$10\.00/);
    expect(text).toMatch(/Tax on parts at 8% \$3\.89/);
    expect(text).toMatch(/Total \$262\.49/);
    expect(text).toMatch(/Balance owed \$0\.00/);
    expect(text).toContain("Tax number: PA-44-019283");
    // The office downloads it too.
    expect((await owner.get(`/api/documents/${invoice!.id}/pdf`)).status).toBe(200);

    values.identity.taxNumber = "";
    const snap2 = (await (await owner.get("/api/office/settings")).json()) as { version: number };
    expect((await owner.request("/api/office/settings", { method: "PUT", json: { ...values, version: snap2.version } })).status).toBe(200);
    expect(await pdfText(await client.get(`/api/documents/${invoice!.id}/pdf`))).not.toContain("Tax number");
  });

  it("gives the owner a printable estimate of the newest revision; nobody else's documents", async () => {
    const { job, client, label } = await jobOwing("estimate_sent");
    await sql("update estimate_revision set status = 'sent' where id = $1", [job.revisionId]);
    const res = await client.get(`/api/documents/estimates/${job.jobId}/pdf`);
    expect(res.status).toBe(200);
    const text = await pdfText(res);
    expect(text).toContain("Estimate");
    expect(text).toContain(label);
    expect(text).toMatch(/1, waiting for your decision/);
    expect(text).toContain("$312.40");

    const paid = await jobOwing();
    const r = (await (await owner.post("/api/office/payments/manual", cash(paid.label, "312.40"))).json()) as { receiptId: string };
    const other = await signedIn(DEMO.customer2);
    expect((await other.get(`/api/documents/${r.receiptId}/pdf`)).status).toBe(404);
    expect((await other.get(`/api/documents/estimates/${job.jobId}/pdf`)).status).toBe(404);
    expect((await (await signedIn(DEMO.tech)).get(`/api/documents/${r.receiptId}/pdf`)).status).toBe(404);
    expect((await new TestClient().get(`/api/documents/${r.receiptId}/pdf`)).status).toBe(404);
    expect((await client.get(`/api/documents/${randomUUID()}/pdf`)).status).toBe(404);
    expect((await paid.client.get(`/api/documents/${r.receiptId}/pdf`)).status).toBe(200);
  });

  it("issues a refund note once the processor confirms a refund", async () => {
    const { paymentId } = await paidPaymentWithCharge(9000);
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "30.00", reason: "Dial glass not replaced" });
    expect(res.status).toBe(202);
    const { refundId } = (await res.json()) as { refundId: string };
    const note = await waitFor(
      async () =>
        (
          await sql<{ id: string; number: string }>("select id, number from money_document where refund_id = $1 and kind = 'refund'", [
            refundId,
          ])
        )[0],
      { what: "the refund note" },
    );
    expect(note.number).toMatch(/^RFD-\d{4}-\d{4,}$/);
    const text = await pdfText(await owner.get(`/api/documents/${note.id}/pdf`));
    expect(text).toContain(note.number);
    expect(text).toMatch(/Amount refunded \$30\.00/);
    // The payment belongs to another owner's job: Mira gets not-found.
    expect((await (await signedIn(DEMO.customer)).get(`/api/documents/${note.id}/pdf`)).status).toBe(404);
  });
});
