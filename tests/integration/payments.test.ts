import { afterAll, describe, expect, it } from "vitest";
import { newCustomer } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import type { TestClient } from "../support/http";
import { listMail, waitForMail } from "../support/mail";
import { seedJobWithEstimate, type SeededJob } from "../fixtures/jobs";
import {
  deliver,
  failNextStripeCalls,
  payOnStandin,
  sessionIdFrom,
  signedHeader,
  standinEvents,
  stripeClient,
  variant,
  waitForEvent,
} from "../fixtures/stripe";

afterAll(async () => {
  await closeTestPool();
});

type Ready = { client: TestClient; email: string; job: SeededJob; sessionId: string; url: string };

// A new owner with an approved estimate and an open deposit checkout.
async function approvedWithCheckout(): Promise<Ready> {
  const { client, email } = await newCustomer("payer");
  const job = await seedJobWithEstimate({ email });
  const approve = await client.post(`/api/portal/jobs/${job.jobId}/estimate/approve`, { revisionId: job.revisionId });
  expect(approve.status).toBe(200);
  const res = await client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" });
  expect(res.status).toBe(200);
  const body = (await res.json()) as { kind: string; url: string };
  expect(body.kind).toBe("redirect");
  return { client, email, job, url: body.url, sessionId: sessionIdFrom(body.url) };
}

async function jobState(jobId: string): Promise<string> {
  const [row] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
  return row!.state;
}

async function effects(jobId: string) {
  const [counts] = await sql<{ paid: string; moves: string; mails: string }>(
    `select
       (select count(*) from payment where job_id = $1 and status = 'paid') as paid,
       (select count(*) from job_state_history where job_id = $1 and to_state in ('deposit_paid', 'paid_in_full')) as moves,
       (select count(*) from email_outbox where template in ('deposit-receipt', 'balance-receipt') and props->>'url' like '%' || $1) as mails`,
    [jobId],
  );
  return { paid: Number(counts!.paid), moves: Number(counts!.moves), mails: Number(counts!.mails) };
}

async function waitFor<T>(fn: () => Promise<T>, ok: (v: T) => boolean, timeoutMs = 20_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let last = await fn();
  while (!ok(last) && Date.now() < deadline) {
    await new Promise((r) => setTimeout(r, 250));
    last = await fn();
  }
  return last;
}

describe("deposit checkout", () => {
  it("takes the amount from the approved revision and makes one session for a double click", async () => {
    const { client, email } = await newCustomer("double");
    const job = await seedJobWithEstimate({ email, depositMinor: 10450, totalMinor: 34800 });
    await client.post(`/api/portal/jobs/${job.jobId}/estimate/approve`, { revisionId: job.revisionId });
    const [a, b] = await Promise.all([
      client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit", amountMinor: 1 }),
      client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" }),
    ]);
    const [ja, jb] = [(await a.json()) as { url: string }, (await b.json()) as { url: string }];
    expect(ja.url).toBe(jb.url);
    const rows = await sql<{ amount_minor: number; currency: string; idempotency_key: string }>(
      "select amount_minor, currency, idempotency_key from payment where job_id = $1",
      [job.jobId],
    );
    expect(rows).toHaveLength(1);
    expect(rows[0]!.amount_minor).toBe(10450);
    expect(rows[0]!.currency).toBe("USD");
    const session = await stripeClient().checkout.sessions.retrieve(sessionIdFrom(ja.url));
    expect(session.amount_total).toBe(10450);
    expect(session.metadata).toMatchObject({ jobId: job.jobId, revisionId: job.revisionId, purpose: "deposit" });
  });

  it("refuses a deposit before the estimate is approved", async () => {
    const { client, email } = await newCustomer("early");
    const job = await seedJobWithEstimate({ email });
    const res = await client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" });
    expect(res.status).toBe(409);
    expect(await sql("select 1 from payment where job_id = $1", [job.jobId])).toHaveLength(0);
  });

  it("leaves nothing changed and says to retry when the payment service fails", async () => {
    const { client, email } = await newCustomer("outage");
    const job = await seedJobWithEstimate({ email });
    await client.post(`/api/portal/jobs/${job.jobId}/estimate/approve`, { revisionId: job.revisionId });
    await failNextStripeCalls(job.jobId, 2);
    const res = await client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" });
    expect(res.status).toBe(503);
    const body = (await res.json()) as { error: { message: string } };
    expect(body.error.message).toMatch(/Nothing was charged.*try again/);
    expect(await sql("select 1 from payment where job_id = $1", [job.jobId])).toHaveLength(0);
    expect(await jobState(job.jobId)).toBe("approved");
    // Once the service is back, the same request works.
    const again = await client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" });
    expect(again.status).toBe(200);
  });
});

describe("stripe webhook", () => {
  it("records the deposit from the stand-in's own signed delivery and e-mails one receipt", async () => {
    const { email, job, sessionId } = await approvedWithCheckout();
    const paid = await payOnStandin(sessionId, "succeed");
    expect(paid.status).toBe(303);
    expect(paid.headers.get("location")).toContain(`/portal/jobs/${job.jobId}/payment?session_id=${sessionId}`);
    expect(
      await waitFor(
        () => jobState(job.jobId),
        (s) => s === "deposit_paid",
      ),
    ).toBe("deposit_paid");
    const mail = await waitForMail(email, "Deposit received");
    expect(mail.text).toContain("$93.72");
    const [history] = await sql<{ actor_id: string | null; from_state: string }>(
      "select actor_id, from_state from job_state_history where job_id = $1 and to_state = 'deposit_paid'",
      [job.jobId],
    );
    expect(history).toMatchObject({ actor_id: null, from_state: "approved" });
  });

  it("applies the same event delivered five times once: one payment, one e-mail, one state change", async () => {
    const { email, job, sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "succeed", { hold: true });
    const ev = await waitForEvent(sessionId, "checkout.session.completed");
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await deliver(ev.payload)).status);
    expect(statuses).toEqual([200, 200, 200, 200, 200]);
    expect(await effects(job.jobId)).toEqual({ paid: 1, moves: 1, mails: 1 });
    expect(await jobState(job.jobId)).toBe("deposit_paid");
    expect(await sql("select 1 from payment_event where id = $1", [ev.id])).toHaveLength(1);
    await waitForMail(email, "Deposit received");
    await new Promise((r) => setTimeout(r, 1500));
    expect((await listMail(email)).filter((m) => m.subject.includes("Deposit received"))).toHaveLength(1);
  });

  it("applies two deliveries arriving at the same moment once", async () => {
    const { job, sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "succeed", { hold: true });
    const ev = await waitForEvent(sessionId, "checkout.session.completed");
    const [a, b] = await Promise.all([deliver(ev.payload), deliver(ev.payload)]);
    expect([a.status, b.status]).toEqual([200, 200]);
    const outcomes = [((await a.json()) as { outcome: string }).outcome, ((await b.json()) as { outcome: string }).outcome].sort();
    expect(outcomes).toEqual(["duplicate", "paid"]);
    expect(await effects(job.jobId)).toEqual({ paid: 1, moves: 1, mails: 1 });
  });

  it("refuses a tampered body, a wrong secret and a missing signature with 400", async () => {
    const { job, sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "succeed", { hold: true });
    const ev = await waitForEvent(sessionId, "checkout.session.completed");
    const header = signedHeader(ev.payload);
    const tampered = ev.payload.replace('"amount_total":9372', '"amount_total":1');
    expect(tampered).not.toBe(ev.payload);
    expect((await deliver(tampered, header)).status).toBe(400);
    expect((await deliver(ev.payload, signedHeader(ev.payload, { secret: "whsec_someone_else" }))).status).toBe(400);
    const bare = await fetch(`${process.env.APP_URL}/api/webhooks/stripe`, {
      method: "POST",
      body: ev.payload,
      headers: { "content-type": "application/json" },
    });
    expect(bare.status).toBe(400);
    expect(await effects(job.jobId)).toEqual({ paid: 0, moves: 0, mails: 0 });
    expect(await sql("select 1 from payment_event where id = $1", [ev.id])).toHaveLength(0);
  });

  it("stores an event for a checkout session it never opened once, as unknown, and changes nothing", async () => {
    const id = `evt_test_unknown_${Date.now()}_${Math.floor(Math.random() * 1e6)}`;
    const payload = JSON.stringify({
      id,
      object: "event",
      type: "checkout.session.completed",
      created: Math.floor(Date.now() / 1000),
      data: {
        object: {
          id: `cs_test_nobody_${id}`,
          object: "checkout.session",
          payment_status: "paid",
          amount_total: 9372,
          currency: "usd",
          metadata: {},
        },
      },
    });
    const paidBefore = await sql<{ n: number }>("select count(*)::int as n from payment where status = 'paid'");
    const first = await deliver(payload);
    expect(first.status).toBe(200);
    expect(((await first.json()) as { outcome: string }).outcome).toBe("unknown-session");
    const again = await deliver(payload);
    expect(again.status).toBe(200);
    expect(((await again.json()) as { outcome: string }).outcome).toBe("duplicate");
    const stored = await sql<{ outcome: string; payment_id: string | null }>(
      "select outcome, payment_id from payment_event where id = $1",
      [id],
    );
    expect(stored).toEqual([{ outcome: "unknown-session", payment_id: null }]);
    expect(await sql<{ n: number }>("select count(*)::int as n from payment where status = 'paid'")).toEqual(paidBefore);
  });

  it("refuses an event signed ten minutes ago", async () => {
    const { job, sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "succeed", { hold: true });
    const ev = await waitForEvent(sessionId, "checkout.session.completed");
    const old = signedHeader(ev.payload, { timestamp: Math.floor(Date.now() / 1000) - 600 });
    expect((await deliver(ev.payload, old)).status).toBe(400);
    expect(await jobState(job.jobId)).toBe("approved");
    // The same event signed now is accepted.
    expect((await deliver(ev.payload)).status).toBe(200);
    expect(await jobState(job.jobId)).toBe("deposit_paid");
  });

  it("does not mark paid when the amount or the currency differs from our records, and logs it", async () => {
    const { job, sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "succeed", { hold: true });
    const ev = await waitForEvent(sessionId, "checkout.session.completed");
    const cheaper = variant(ev.payload, (o) => {
      o.amount_total = 100;
    });
    const otherCurrency = variant(ev.payload, (o) => {
      o.currency = "eur";
    });
    for (const payload of [cheaper, otherCurrency]) {
      const res = await deliver(payload);
      expect(res.status).toBe(200);
      expect(((await res.json()) as { outcome: string }).outcome).toMatch(/^mismatch/);
    }
    expect(await effects(job.jobId)).toEqual({ paid: 0, moves: 0, mails: 0 });
    expect(await jobState(job.jobId)).toBe("approved");
    const logged = await sql<{ after: { problems: string[] } }>(
      "select a.after from audit_event a join payment p on p.id::text = a.entity_id where p.job_id = $1 and a.action = 'payment.mismatch'",
      [job.jobId],
    );
    expect(logged).toHaveLength(2);
    expect(logged.flatMap((l) => l.after.problems).join(" ")).toMatch(/amount.*currency|currency.*amount/s);
  });

  it("reaches the same final state whatever order the events arrive in", async () => {
    const finals: unknown[] = [];
    for (const order of ["forward", "reverse"] as const) {
      const { job, sessionId } = await approvedWithCheckout();
      await payOnStandin(sessionId, "delayed-success", { hold: true });
      const completed = await waitForEvent(sessionId, "checkout.session.completed");
      const succeeded = await waitForEvent(sessionId, "checkout.session.async_payment_succeeded");
      const expired = variant(completed.payload, (o) => {
        o.status = "expired";
        o.payment_status = "unpaid";
      }).replace('"type":"checkout.session.completed"', '"type":"checkout.session.expired"');
      const sequence =
        order === "forward" ? [completed.payload, succeeded.payload, expired] : [expired, succeeded.payload, completed.payload];
      for (const payload of sequence) expect((await deliver(payload)).status).toBe(200);
      const [row] = await sql<{ status: string }>("select status from payment where job_id = $1", [job.jobId]);
      finals.push({ payment: row!.status, job: await jobState(job.jobId), ...(await effects(job.jobId)) });
    }
    expect(finals[0]).toEqual({ payment: "paid", job: "deposit_paid", paid: 1, moves: 1, mails: 1 });
    expect(finals[1]).toEqual(finals[0]);
  });

  it("shows a delayed payment as processing until it is confirmed", async () => {
    const { client, job, sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "delayed-success", { hold: true });
    const completed = await waitForEvent(sessionId, "checkout.session.completed");
    await deliver(completed.payload);
    const status = await client.get(`/api/payments/session/${sessionId}`);
    expect(((await status.json()) as { status: string }).status).toBe("processing");
    expect(await jobState(job.jobId)).toBe("approved");
    const view = (await (await client.get(`/api/portal/jobs/${job.jobId}`)).json()) as { confirming: boolean };
    expect(view.confirming).toBe(true);
  });

  it("ignores event types it does not handle, with a 2xx", async () => {
    const { sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "succeed", { hold: true });
    const ev = (await standinEvents(sessionId)).find((e) => e.type === "payment_intent.succeeded");
    const res = await deliver(ev!.payload);
    expect(res.status).toBe(200);
    expect(((await res.json()) as { outcome: string }).outcome).toBe("ignored");
  });
});

describe("balance and refunds", () => {
  it("takes the balance (total less the deposit) and moves the job to paid in full", async () => {
    const { client, email, job, sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "succeed");
    await waitFor(
      () => jobState(job.jobId),
      (s) => s === "deposit_paid",
    );
    // The bench steps in between are not part of this test: put the job where completion leaves it.
    await sql("update job set state = 'balance_due' where id = $1", [job.jobId]);
    const res = await client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "balance" });
    const body = (await res.json()) as { url: string };
    const balanceSession = sessionIdFrom(body.url);
    const session = await stripeClient().checkout.sessions.retrieve(balanceSession);
    expect(session.amount_total).toBe(31240 - 9372);
    await payOnStandin(balanceSession, "succeed");
    expect(
      await waitFor(
        () => jobState(job.jobId),
        (s) => s === "paid_in_full",
      ),
    ).toBe("paid_in_full");
    const mail = await waitForMail(email, "Payment in full received");
    expect(mail.text).toContain("$218.68");
  });

  it("settles the office's refund row from charge.refunded", async () => {
    const { job, sessionId } = await approvedWithCheckout();
    await payOnStandin(sessionId, "succeed");
    await waitFor(
      () => jobState(job.jobId),
      (s) => s === "deposit_paid",
    );
    const [payment] = await sql<{ id: string; payment_intent_id: string }>(
      "select id, payment_intent_id from payment where job_id = $1 and status = 'paid'",
      [job.jobId],
    );
    const [refund] = await sql<{ id: string }>(
      "insert into refund (payment_id, amount_minor, reason, idempotency_key) values ($1, 2000, 'Goodwill: dial glass arrived cracked', $2) returning id",
      [payment!.id, `refund-test-${payment!.id}`],
    );
    await stripeClient().refunds.create(
      { payment_intent: payment!.payment_intent_id, amount: 2000, metadata: { refundId: refund!.id } },
      { idempotencyKey: `refund-${refund!.id}` },
    );
    const settled = await waitFor(
      async () =>
        (
          await sql<{ status: string; refunded_minor: number; processor_refund_id: string | null }>(
            "select r.status, p.refunded_minor, r.processor_refund_id from refund r join payment p on p.id = r.payment_id where r.id = $1",
            [refund!.id],
          )
        )[0]!,
      (r) => r.status === "succeeded" && r.refunded_minor === 2000,
    );
    expect(settled.status).toBe("succeeded");
    expect(settled.refunded_minor).toBe(2000);
    expect(settled.processor_refund_id).toMatch(/^re_/);
  });
});
