import { randomUUID } from "node:crypto";
import { sql } from "../support/db";
import { testEnv } from "../support/env";

// Rows for the office tests, written straight into the database, plus a real paid charge in the payment stand-in
// (a refund needs a payment intent the processor knows).

export const FIXTURE_CUSTOMER = "demo-cust-ines";

export async function insertJob({
  state,
  createdAt = new Date(),
  receivedAt = null,
  returnedAt = null,
  customerId = FIXTURE_CUSTOMER,
}: {
  state: string;
  createdAt?: Date;
  receivedAt?: Date | null;
  returnedAt?: Date | null;
  customerId?: string;
}): Promise<{ jobId: string; number: number }> {
  const [set] = await sql<{ id: string }>(
    `insert into radio_set (owner_id, maker, model, year, kind, profile)
     values ($1, 'Aurelian', 'Model 5T-40', 1951, 'tube-acdc', $2::jsonb) returning id`,
    [customerId, JSON.stringify({ kind: "tube-acdc", bands: [{ kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455 }] })],
  );
  const [job] = await sql<{ id: string; number: number }>(
    `insert into job (set_id, customer_id, state, symptoms, received_at, returned_at, created_at, updated_at)
     values ($1, $2, $3, 'Hum and no stations', $4, $5, $6, $6) returning id, number`,
    [set!.id, customerId, state, receivedAt, returnedAt, createdAt],
  );
  return { jobId: job!.id, number: job!.number };
}

export async function insertHistory(jobId: string, toState: string, at: Date): Promise<void> {
  await sql(`insert into job_state_history (job_id, from_state, to_state, at) values ($1, null, $2, $3)`, [jobId, toState, at]);
}

async function revisionFor(jobId: string, totalMinor: number): Promise<string> {
  const existing = await sql<{ id: string }>(`select id from estimate_revision where job_id = $1 order by revision desc limit 1`, [jobId]);
  if (existing[0]) return existing[0].id;
  const [estimate] = await sql<{ id: string }>(
    `insert into estimate (job_id, draft, current_revision) values ($1, '{}'::jsonb, 1) returning id`,
    [jobId],
  );
  const [rev] = await sql<{ id: string }>(
    `insert into estimate_revision (estimate_id, job_id, revision, status, currency, labour_minor, parts_minor, tax_minor, total_minor, deposit_minor, pricing)
     values ($1, $2, 1, 'approved', 'usd', $3, 0, 0, $3, $4, '{}'::jsonb) returning id`,
    [estimate!.id, jobId, totalMinor, Math.round(totalMinor * 0.3)],
  );
  return rev!.id;
}

export async function insertPayment({
  jobId,
  purpose,
  amountMinor,
  status = "paid",
  paidAt = new Date(),
  refundedMinor = 0,
  paymentIntentId = null,
}: {
  jobId: string;
  purpose: "deposit" | "balance";
  amountMinor: number;
  status?: string;
  paidAt?: Date | null;
  refundedMinor?: number;
  paymentIntentId?: string | null;
}): Promise<string> {
  const revisionId = await revisionFor(jobId, amountMinor * 3);
  const [p] = await sql<{ id: string }>(
    `insert into payment (job_id, revision_id, purpose, amount_minor, currency, status, payment_intent_id, idempotency_key, refunded_minor, paid_at)
     values ($1, $2, $3, $4, 'usd', $5, $6, $7, $8, $9) returning id`,
    [jobId, revisionId, purpose, amountMinor, status, paymentIntentId, `fixture-${randomUUID()}`, refundedMinor, paidAt],
  );
  return p!.id;
}

export async function insertRefund({
  paymentId,
  amountMinor,
  status,
  settledAt,
}: {
  paymentId: string;
  amountMinor: number;
  status: string;
  settledAt: Date | null;
}) {
  await sql(
    `insert into refund (payment_id, amount_minor, reason, status, idempotency_key, settled_at) values ($1, $2, 'Fixture refund', $3, $4, $5)`,
    [paymentId, amountMinor, status, `fixture-${randomUUID()}`, settledAt],
  );
}

async function standIn(path: string, init: RequestInit = {}): Promise<Response> {
  const headers = new Headers(init.headers);
  headers.set("authorization", `Bearer ${process.env.STRIPE_SECRET_KEY}`);
  return fetch(new URL(path, testEnv.stripeUrl), { ...init, headers, redirect: "manual" });
}

/**
 * A charge the stand-in knows as paid (its completion webhook held back, so the app's payment flow does not run),
 * and a paid payment row pointing at its payment intent.
 */
export async function paidPaymentWithCharge(amountMinor: number): Promise<{ paymentId: string; jobId: string; paymentIntentId: string }> {
  const form = new URLSearchParams({
    mode: "payment",
    success_url: `${testEnv.appUrl}/portal`,
    cancel_url: `${testEnv.appUrl}/portal`,
    "line_items[0][quantity]": "1",
    "line_items[0][price_data][currency]": "usd",
    "line_items[0][price_data][unit_amount]": String(amountMinor),
    "line_items[0][price_data][product_data][name]": "Deposit, office test",
  });
  const created = await standIn("/v1/checkout/sessions", {
    method: "POST",
    body: form,
    headers: { "content-type": "application/x-www-form-urlencoded" },
  });
  if (!created.ok) throw new Error(`stand-in session: ${created.status} ${await created.text()}`);
  const session = (await created.json()) as { id: string };
  const paid = await fetch(new URL(`/checkout/${session.id}/pay`, testEnv.stripeUrl), {
    method: "POST",
    body: new URLSearchParams({ outcome: "succeed", deliver: "hold" }),
    headers: { "content-type": "application/x-www-form-urlencoded" },
    redirect: "manual",
  });
  if (paid.status !== 303) throw new Error(`stand-in pay: ${paid.status}`);
  const after = (await (await standIn(`/v1/checkout/sessions/${session.id}`)).json()) as { payment_intent: string };
  const { jobId } = await insertJob({ state: "deposit_paid" });
  const paymentId = await insertPayment({ jobId, purpose: "deposit", amountMinor, paymentIntentId: after.payment_intent });
  return { paymentId, jobId, paymentIntentId: after.payment_intent };
}

/** Makes the stand-in answer the next `count` API calls whose body or path contains `match` with a 500. */
export async function failNextProcessorCalls(match: string, count: number): Promise<void> {
  const res = await fetch(
    new URL(`/control/fail-next?${new URLSearchParams({ match, count: String(count), mode: "error" })}`, testEnv.stripeUrl),
    { method: "POST" },
  );
  if (!res.ok) throw new Error(`stand-in fail-next: ${res.status}`);
}

export async function waitFor<T>(
  probe: () => Promise<T | null | undefined | false>,
  { timeoutMs = 20_000, what = "condition" } = {},
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** Makes the stand-in act on the next `count` calls matching `match` but never answer them (a lost reply). */
export async function loseNextProcessorReplies(match: string, count: number, { holdEvents = false } = {}): Promise<void> {
  const params = new URLSearchParams({ match, count: String(count), mode: "lost-reply", ...(holdEvents ? { deliver: "hold" } : {}) });
  const res = await fetch(new URL(`/control/fail-next?${params}`, testEnv.stripeUrl), { method: "POST" });
  if (!res.ok) throw new Error(`stand-in fail-next: ${res.status}`);
}

/** The refunds the stand-in (the processor) has made on a payment intent. */
export async function processorRefunds(
  paymentIntentId: string,
): Promise<{ id: string; amount: number; metadata: Record<string, string> }[]> {
  const res = await standIn(`/v1/refunds?${new URLSearchParams({ payment_intent: paymentIntentId })}`);
  if (!res.ok) throw new Error(`stand-in refunds: ${res.status}`);
  return ((await res.json()) as { data: { id: string; amount: number; metadata: Record<string, string> }[] }).data;
}

/** Delivers the stand-in's held events of one type whose payload mentions `contains`; returns how many. */
export async function deliverHeldEvents(type: string, contains: string): Promise<number> {
  const res = await fetch(new URL(`/control/events?${new URLSearchParams({ type })}`, testEnv.stripeUrl));
  const events = ((await res.json()) as { data: { id: string; payload: string; delivered: boolean }[] }).data.filter(
    (e) => !e.delivered && e.payload.includes(contains),
  );
  for (const e of events) await fetch(new URL(`/control/events/${e.id}/deliver`, testEnv.stripeUrl), { method: "POST" });
  return events.length;
}

/**
 * A second checkout paid for a deposit that is already paid (a double payment): the stand-in's completion
 * event is delivered to the app, which records the payment as a duplicate charge.
 */
export async function duplicateCharge(): Promise<{ paymentId: string; jobId: string; firstPaymentId: string; paymentIntentId: string }> {
  const first = await paidPaymentWithCharge(2500);
  const [rev] = await sql<{ revision_id: string }>(`select revision_id from payment where id = $1`, [first.paymentId]);
  const form = new URLSearchParams({
    mode: "payment",
    success_url: `${testEnv.appUrl}/portal`,
    cancel_url: `${testEnv.appUrl}/portal`,
    "line_items[0][quantity]": "1",
    "line_items[0][price_data][currency]": "usd",
    "line_items[0][price_data][unit_amount]": "2500",
    "line_items[0][price_data][product_data][name]": "Deposit, paid twice",
    "metadata[jobId]": first.jobId,
    "metadata[revisionId]": rev!.revision_id,
    "metadata[purpose]": "deposit",
  });
  const created = await standIn("/v1/checkout/sessions", {
    method: "POST",
    body: form,
    headers: { "content-type": "application/x-www-form-urlencoded" },
  });
  const session = (await created.json()) as { id: string };
  const [p] = await sql<{ id: string }>(
    `insert into payment (job_id, revision_id, purpose, amount_minor, currency, status, checkout_session_id, idempotency_key)
     values ($1, $2, 'deposit', 2500, 'usd', 'open', $3, $4) returning id`,
    [first.jobId, rev!.revision_id, session.id, `fixture-${randomUUID()}`],
  );
  const paid = await fetch(new URL(`/checkout/${session.id}/pay`, testEnv.stripeUrl), {
    method: "POST",
    body: new URLSearchParams({ outcome: "succeed", deliver: "hold" }),
    headers: { "content-type": "application/x-www-form-urlencoded" },
    redirect: "manual",
  });
  if (paid.status !== 303) throw new Error(`stand-in pay: ${paid.status}`);
  await deliverHeldEvents("checkout.session.completed", session.id);
  const after = await waitFor(
    async () => {
      const [row] = await sql<{ status: string; payment_intent_id: string }>(
        `select status, payment_intent_id from payment where id = $1`,
        [p!.id],
      );
      return row?.status === "duplicate" ? row : null;
    },
    { what: "the second payment to be recorded as a duplicate charge" },
  );
  return { paymentId: p!.id, jobId: first.jobId, firstPaymentId: first.paymentId, paymentIntentId: after.payment_intent_id };
}
