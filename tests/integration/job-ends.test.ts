import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import type { TestClient } from "../support/http";
import { waitForMail } from "../support/mail";
import { failNextStripeCalls, payOnStandin, sessionIdFrom, stripeClient, waitForEvent } from "../fixtures/stripe";
import pg from "pg";
import { toAppError } from "@/lib/server/errors";
import { testEnv } from "../support/env";
import { createJob } from "./bench-fixtures";
import { createCertificate, stopQueue } from "./certificates-fixtures";

// Paths that must reach their end, through the real routes: warranty work and jobs with nothing left to pay,
// a scope change while the set is on the bench, the one account of what is owed, stale checkouts, and a
// slow processor that must not hold the job.

let tech: TestClient;
beforeAll(async () => {
  tech = await signedIn(DEMO.tech);
});
afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

type DraftLine = { key: string; kind: string; code: string; title: string; category: string; minutes: number; [k: string]: unknown };
type SheetReq = { key: string; unit: string; nominal: number | null };

async function state(jobId: string): Promise<string> {
  const [row] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
  return row!.state;
}

async function waitForState(jobId: string, want: string, timeoutMs = 20_000): Promise<string> {
  const deadline = Date.now() + timeoutMs;
  let s = await state(jobId);
  while (s !== want && Date.now() < deadline) {
    await new Promise((r) => setTimeout(r, 250));
    s = await state(jobId);
  }
  return s;
}

async function draft(jobId: string): Promise<{ version: number; lines: DraftLine[] }> {
  const res = await tech.get(`/api/bench/jobs/${jobId}/estimate`);
  expect(res.status).toBe(200);
  return (await res.json()) as { version: number; lines: DraftLine[] };
}

/** Saves `lines` over the draft and sends them as the next revision. */
async function sendLines(jobId: string, lines: DraftLine[], changeSummary?: string) {
  const { version } = await draft(jobId);
  const saved = await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version, lines } });
  expect(saved.status).toBe(200);
  const { version: next } = (await saved.json()) as { version: number };
  const sent = await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version: next, ...(changeSummary ? { changeSummary } : {}) });
  expect(sent.status, await sent.clone().text()).toBe(200);
  const [rev] = await sql<{ id: string; total_minor: number; deposit_minor: number }>(
    "select id, total_minor, deposit_minor from estimate_revision where job_id = $1 order by revision desc limit 1",
    [jobId],
  );
  return rev!;
}

/** The owner's checkout for `purpose`, paid at the stand-in; waits for the job to reach `then`. */
async function pay(owner: TestClient, jobId: string, purpose: "deposit" | "balance", then: string) {
  const res = await owner.post("/api/payments/checkout", { jobId, purpose });
  expect(res.status, await res.clone().text()).toBe(200);
  const { url } = (await res.json()) as { url: string };
  const sessionId = sessionIdFrom(url);
  const session = await stripeClient().checkout.sessions.retrieve(sessionId);
  await payOnStandin(sessionId, "succeed");
  expect(await waitForState(jobId, then)).toBe(then);
  return session.amount_total!;
}

/** Bench work with every reading on its nominal and every line ticked, then completion. */
async function finishAtBench(jobId: string) {
  if ((await state(jobId)) === "deposit_paid") expect((await tech.post(`/api/bench/jobs/${jobId}/start-bench`)).status).toBe(200);
  const sheet = (await (await tech.get(`/api/bench/jobs/${jobId}/sheet`)).json()) as {
    requirements: SheetReq[];
    tasks: { code: string }[];
  };
  for (const r of sheet.requirements) {
    const value = r.unit === "mA" ? 0.12 : (r.nominal ?? 120);
    expect((await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: r.key, value })).status).toBe(200);
  }
  for (const t of sheet.tasks) expect((await tech.post(`/api/bench/jobs/${jobId}/tasks`, { code: t.code, done: true })).status).toBe(200);
  expect((await tech.post(`/api/bench/jobs/${jobId}/final-checks`)).status).toBe(200);
  const done = await tech.post(`/api/bench/jobs/${jobId}/complete`);
  expect(done.status, await done.clone().text()).toBe(200);
  return (await done.json()) as { balanceMinor: number; owedBackMinor: number; movedOn: boolean };
}

async function portal(owner: TestClient, jobId: string) {
  const res = await owner.get(`/api/portal/jobs/${jobId}`);
  expect(res.status).toBe(200);
  return (await res.json()) as {
    due: { purpose: string; amount: { minor: number } } | null;
    account: { owed: { minor: number }; owedBack: { minor: number }; paid: { minor: number } };
    estimate: { id: string; atBench: boolean; decidable: boolean } | null;
  };
}

/** A new owner's job, estimate sent, approved and its deposit paid through the stand-in: on the bench. */
async function jobOnBench(label: string) {
  const { client: owner, email } = await newCustomer(label);
  const { jobId, number } = await createJob({ customerEmail: email, state: "in_triage", technicianEmail: DEMO.tech.email });
  const first = await draft(jobId);
  const rev1 = await sendLines(jobId, first.lines);
  expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev1.id })).status).toBe(200);
  const deposit = await pay(owner, jobId, "deposit", "deposit_paid");
  expect(deposit).toBe(rev1.deposit_minor);
  expect((await tech.post(`/api/bench/jobs/${jobId}/start-bench`)).status).toBe(200);
  return { owner, email, jobId, number, rev1, lines: first.lines };
}

const jobNo = (n: number) => `KL-${String(n).padStart(4, "0")}`;

describe("warranty work and jobs with nothing left to pay", () => {
  it("takes a warranty job from the claim to its own certificate, which names the certificate and claim it answers", async () => {
    const original = await createCertificate();
    const mira = await signedIn(DEMO.customer);
    const opened = await mira.post("/api/claims", {
      symptomCategory: "hum",
      description: "A loud hum after ten minutes of play, getting worse.",
      statements: [],
      certificateId: original.certificateId,
    });
    expect(opened.status).toBe(201);
    const { claim } = (await opened.json()) as { claim: { id: string } };
    const accepted = await tech.post(`/api/claims/${claim.id}/decision`, { decision: "accept", reason: "Our filter capacitor failed." });
    expect(accepted.status).toBe(200);
    const { warrantyJobId: jobId } = (await accepted.json()) as { warrantyJobId: string };

    // Covered lines at no charge: the whole estimate is zero, so there is no deposit and no balance.
    const rev = await sendLines(jobId, (await draft(jobId)).lines);
    expect(rev.total_minor).toBe(0);
    expect((await mira.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev.id })).status).toBe(200);
    expect(await state(jobId)).toBe("deposit_paid");

    const done = await finishAtBench(jobId);
    expect(done).toMatchObject({ balanceMinor: 0, owedBackMinor: 0, movedOn: true });
    // Old behaviour: stuck in "balance due" with a checkout answering 409 for ever.
    expect(await state(jobId)).toBe("paid_in_full");
    const [move] = await sql<{ actor_id: string | null; note: string }>(
      "select actor_id, note from job_state_history where job_id = $1 and from_state = 'balance_due' and to_state = 'paid_in_full'",
      [jobId],
    );
    expect(move).toEqual({ actor_id: null, note: "Nothing left to pay" });
    const audits = await sql(
      "select 1 from audit_event where entity_id = $1 and action = 'job.transition' and after->>'state' = 'paid_in_full'",
      [jobId],
    );
    expect(audits).toHaveLength(1);
    expect((await portal(mira, jobId)).due).toBeNull();

    expect((await tech.post(`/api/bench/jobs/${jobId}/return`, { method: "pick-up" })).status).toBe(200);
    const certs = await sql<{ content: { answers?: { certificateCode: string; claimId: string }; work: { code: string }[] } }>(
      "select content from certificate where job_id = $1",
      [jobId],
    );
    expect(certs).toHaveLength(1);
    expect(certs[0]!.content.answers).toMatchObject({ certificateCode: original.code, claimId: claim.id });
    expect(certs[0]!.content.work.length).toBeGreaterThan(0);
    const verify = await (
      await tech.get(`/verify/${(await sql<{ code: string }>("select code from certificate where job_id = $1", [jobId]))[0]!.code}`)
    ).text();
    expect(verify).toContain(original.code);
  });
});

describe("a scope change at the bench", () => {
  it("keeps the set on the bench, asks no deposit, and settles the difference in the balance", async () => {
    const { owner, email, jobId, number, rev1, lines } = await jobOnBench("bench-change");
    const extra: DraftLine = {
      ...lines.find((l) => l.kind === "labour")!,
      key: "mech.dial-cord",
      code: "mech.dial-cord",
      title: "Restring the dial cord",
      category: "mechanical",
      minutes: 45,
      reason: "The dial cord parted during alignment.",
      readings: [],
    };
    const t0 = Date.now() - 50;
    const rev2 = await sendLines(jobId, [...lines, extra], "The dial cord parted during alignment and must be restrung.");
    expect(rev2.total_minor).toBeGreaterThan(rev1.total_minor);
    // Old behaviour: back to "estimate sent", a deposit top-up and "send the set" for a set the shop has.
    expect(await state(jobId)).toBe("bench_revision");
    const mail = await waitForMail(email, `Revised estimate`, { after: t0 });
    expect(mail.text).toMatch(/stays on our bench/);
    expect(mail.text).not.toMatch(/Deposit:/);
    const view = await portal(owner, jobId);
    expect(view.estimate).toMatchObject({ atBench: true, decidable: true });
    expect(view.due).toBeNull();

    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev2.id })).status).toBe(200);
    expect(await state(jobId)).toBe("on_bench");
    const history = await sql<{ from_state: string; to_state: string; note: string | null }>(
      "select from_state, to_state, note from job_state_history where job_id = $1 and from_state is not null order by at",
      [jobId],
    );
    const moves = history.map((h) => `${h.from_state}>${h.to_state}`);
    expect(moves).toContain("on_bench>bench_revision");
    expect(moves).toContain("bench_revision>on_bench");
    // One "set received", one deposit move: nothing was asked twice.
    expect(moves.filter((m) => m === "deposit_paid>on_bench")).toHaveLength(1);
    expect(moves.filter((m) => m.endsWith(">deposit_paid"))).toHaveLength(1);
    expect(history.some((h) => h.note?.includes("Revision 2"))).toBe(true);
    // The new line is on the bench checklist.
    expect(await sql("select 1 from job_task where job_id = $1 and code = 'mech.dial-cord'", [jobId])).toHaveLength(1);

    const done = await finishAtBench(jobId);
    // Balance = new total − deposit paid (arithmetic on the stored rows, not the code's own function).
    expect(done.balanceMinor).toBe(rev2.total_minor - rev1.deposit_minor);
    const balance = await pay(owner, jobId, "balance", "paid_in_full");
    expect(balance).toBe(rev2.total_minor - rev1.deposit_minor);
    await waitForMail(email, `Payment in full received for ${jobNo(number)}`);
  });

  it("after a decline, carries on with the approved scope or returns the set as is, as the owner chooses", async () => {
    const a = await jobOnBench("bench-decline");
    const extra = {
      ...a.lines.find((l) => l.kind === "labour")!,
      key: "mech.x",
      code: "mech.x",
      title: "Refinish the cabinet",
      minutes: 90,
    };
    const rev2 = await sendLines(a.jobId, [...a.lines, extra], "The cabinet finish is crazed; we can refinish it.");
    const missing = await a.owner.post(`/api/portal/jobs/${a.jobId}/estimate/decline`, { revisionId: rev2.id, reason: "Not now, thanks" });
    expect(missing.status).toBe(400);
    expect(((await missing.json()) as { error: { fields: Record<string, string> } }).error.fields.afterDecline).toMatch(/choose/i);
    const keep = await a.owner.post(`/api/portal/jobs/${a.jobId}/estimate/decline`, {
      revisionId: rev2.id,
      reason: "Not now, thanks",
      afterDecline: "approved-scope",
    });
    expect(keep.status).toBe(200);
    expect(await state(a.jobId)).toBe("on_bench");
    expect(await sql("select 1 from job_task where job_id = $1 and code = 'mech.x'", [a.jobId])).toHaveLength(0);
    const kept = await finishAtBench(a.jobId);
    expect(kept.balanceMinor).toBe(a.rev1.total_minor - a.rev1.deposit_minor);

    const b = await jobOnBench("bench-return");
    const rev2b = await sendLines(b.jobId, [...b.lines, extra], "The cabinet finish is crazed; we can refinish it.");
    const back = await b.owner.post(`/api/portal/jobs/${b.jobId}/estimate/decline`, {
      revisionId: rev2b.id,
      reason: "I would rather have it back",
      afterDecline: "return-as-is",
    });
    expect(back.status).toBe(200);
    // The work stops; the deposit paid settles the job, which moves on to its return.
    expect(await state(b.jobId)).toBe("paid_in_full");
    const view = await portal(b.owner, b.jobId);
    expect(view.account.owed.minor).toBe(0);
    expect(view.account.owedBack.minor).toBe(0);
    expect((await tech.post(`/api/bench/jobs/${b.jobId}/return`, { method: "pick-up" })).status).toBe(200);
    expect(await state(b.jobId)).toBe("returned");
  });

  it("shows a cheaper revision after the deposit as money owed back, and the office lists it", async () => {
    const { owner, jobId, number, rev1, lines } = await jobOnBench("bench-cheaper");
    const one = lines.filter((l) => l.kind === "labour").slice(0, 1);
    const rev2 = await sendLines(jobId, one, "Only the inspection was needed: the set works once cleaned.");
    expect(rev2.total_minor).toBeLessThan(rev1.deposit_minor);
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev2.id })).status).toBe(200);
    const done = await finishAtBench(jobId);
    expect(done).toMatchObject({ balanceMinor: 0, movedOn: true, owedBackMinor: rev1.deposit_minor - rev2.total_minor });
    expect(await state(jobId)).toBe("paid_in_full");
    const view = await portal(owner, jobId);
    expect(view.account.owedBack.minor).toBe(rev1.deposit_minor - rev2.total_minor);
    const officeOwner = await signedIn(DEMO.owner);
    const page = await (await officeOwner.get("/office/payments")).text();
    expect(page).toContain("Owed back to owners");
    expect(page).toContain(jobNo(number));
  });
});

describe("one account of what is owed", () => {
  it("asks for the balance less refunds already confirmed", async () => {
    const { owner, jobId, rev1 } = await jobOnBench("refunded");
    const [deposit] = await sql<{ id: string }>("select id from payment where job_id = $1 and status = 'paid'", [jobId]);
    // The office refunded part of the deposit (a cracked dial glass); the processor confirmed it.
    await sql(
      "insert into refund (payment_id, amount_minor, reason, status, idempotency_key, settled_at) values ($1, 1500, 'Dial glass arrived cracked', 'succeeded', $2, now())",
      [deposit!.id, `test-refund-${randomUUID()}`],
    );
    const done = await finishAtBench(jobId);
    // Old checkout: total − paid, ignoring the refund (1500 short).
    expect(done.balanceMinor).toBe(rev1.total_minor - rev1.deposit_minor + 1500);
    expect((await portal(owner, jobId)).due?.amount.minor).toBe(rev1.total_minor - rev1.deposit_minor + 1500);
    const charged = await pay(owner, jobId, "balance", "paid_in_full");
    expect(charged).toBe(rev1.total_minor - rev1.deposit_minor + 1500);
  });
});

describe("stale checkout sessions", () => {
  it("expires an open session when a revision supersedes it, and records a payment that still arrives as owed back", async () => {
    const { client: owner, email } = await newCustomer("stale");
    const { jobId, number } = await createJob({ customerEmail: email, state: "in_triage", technicianEmail: DEMO.tech.email });
    const lines = (await draft(jobId)).lines;
    const rev1 = await sendLines(jobId, lines);
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev1.id })).status).toBe(200);
    const open = (await (await owner.post("/api/payments/checkout", { jobId, purpose: "deposit" })).json()) as { url: string };
    const openId = sessionIdFrom(open.url);

    await sendLines(jobId, lines.slice(0, -1), "One line less after a closer look.");
    // Old behaviour: the session stayed payable at the processor.
    expect((await stripeClient().checkout.sessions.retrieve(openId)).status).toBe("expired");
    const [row] = await sql<{ status: string }>("select status from payment where checkout_session_id = $1", [openId]);
    expect(row!.status).toBe("expired");

    // A payment completed at the processor whose webhook is held: the revision cannot expire it any more.
    const rev3 = await sendLines(jobId, lines, "Back to the full scope.");
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev3.id })).status).toBe(200);
    const second = (await (await owner.post("/api/payments/checkout", { jobId, purpose: "deposit" })).json()) as { url: string };
    const secondId = sessionIdFrom(second.url);
    await payOnStandin(secondId, "succeed", { hold: true });
    await sendLines(jobId, lines.slice(0, -1), "Scope reduced again.");
    const held = await waitForEvent(secondId, "checkout.session.completed");
    await fetch(`${testEnv.stripeUrl}/control/events/${held.id}/deliver`, { method: "POST" });
    const deadline = Date.now() + 15_000;
    let paid: { status: string; arrived_stale: boolean } | undefined;
    while (Date.now() < deadline) {
      [paid] = await sql<{ status: string; arrived_stale: boolean }>(
        "select status, arrived_stale from payment where checkout_session_id = $1",
        [secondId],
      );
      if (paid?.status === "paid") break;
      await new Promise((r) => setTimeout(r, 250));
    }
    // Recorded, never lost, and flagged.
    expect(paid).toEqual({ status: "paid", arrived_stale: true });
    expect(await state(jobId)).toBe("estimate_sent");
    const audit = await sql("select 1 from audit_event where action = 'payment.superseded' and after->>'revisionId' = $1", [rev3.id]);
    expect(audit).toHaveLength(1);
    const page = await (await (await signedIn(DEMO.owner)).get("/office/payments")).text();
    expect(page).toContain(jobNo(number));
    expect(page).toContain("superseded checkout");
  });
});

describe("a completed payment closes the job's other checkouts", () => {
  it("expires another open session of the job at the processor once the deposit is paid", async () => {
    const { client: owner, email } = await newCustomer("other-session");
    const { jobId } = await createJob({ customerEmail: email, state: "in_triage", technicianEmail: DEMO.tech.email });
    const rev = await sendLines(jobId, (await draft(jobId)).lines);
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev.id })).status).toBe(200);
    const { url } = (await (await owner.post("/api/payments/checkout", { jobId, purpose: "deposit" })).json()) as { url: string };
    // A second session for the same job, still open at the processor (as an older amount would be).
    const other = await stripeClient().checkout.sessions.create({
      mode: "payment",
      line_items: [{ quantity: 1, price_data: { currency: "usd", unit_amount: 1234, product_data: { name: "Older amount" } } }],
      metadata: { jobId, revisionId: rev.id, purpose: "deposit" },
      success_url: `${testEnv.appUrl}/portal/jobs/${jobId}/payment?session_id={CHECKOUT_SESSION_ID}`,
      cancel_url: `${testEnv.appUrl}/portal/jobs/${jobId}`,
    });
    await sql(
      "insert into payment (job_id, revision_id, purpose, amount_minor, currency, status, checkout_session_id, idempotency_key) values ($1, $2, 'deposit', 1234, 'USD', 'open', $3, $4)",
      [jobId, rev.id, other.id, `test-other-${randomUUID()}`],
    );
    await payOnStandin(sessionIdFrom(url), "succeed");
    expect(await waitForState(jobId, "deposit_paid")).toBe("deposit_paid");
    const deadline = Date.now() + 15_000;
    let status = (await stripeClient().checkout.sessions.retrieve(other.id)).status;
    while (status !== "expired" && Date.now() < deadline) {
      await new Promise((r) => setTimeout(r, 250));
      status = (await stripeClient().checkout.sessions.retrieve(other.id)).status;
    }
    expect(status).toBe("expired");
    const [row] = await sql<{ status: string }>("select status from payment where checkout_session_id = $1", [other.id]);
    expect(row!.status).toBe("expired");
  });
});

describe("no network call inside a transaction", () => {
  it("keeps the job unlocked while the processor is slow, then answers a retryable 503 and leaves nothing behind", async () => {
    const { client: owner, email } = await newCustomer("slow");
    const { jobId } = await createJob({ customerEmail: email, state: "in_triage", technicianEmail: DEMO.tech.email });
    const rev = await sendLines(jobId, (await draft(jobId)).lines);
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev.id })).status).toBe(200);
    await failNextStripeCalls(jobId, 2, "timeout");
    const pending = owner.post("/api/payments/checkout", { jobId, purpose: "deposit" });
    await new Promise((r) => setTimeout(r, 1500));
    // Old code held the job's row lock across the processor call: this would fail with "could not obtain lock".
    const locked = await sql<{ id: string }>("select id from job where id = $1 for update nowait", [jobId]);
    expect(locked).toHaveLength(1);
    const res = await pending;
    expect(res.status).toBe(503);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/Nothing was charged.*try again/);
    expect(await sql("select 1 from payment where job_id = $1", [jobId])).toHaveLength(0);
    expect(await state(jobId)).toBe("approved");
    const again = await owner.post("/api/payments/checkout", { jobId, purpose: "deposit" });
    expect(again.status).toBe(200);
  }, 60_000);
});

describe("the database pool's acquire timeout", () => {
  it("turns a wait for a connection that never frees into a retryable 503", async () => {
    // pg-pool's own behaviour (the registry package, not our code): with every client taken, connect()
    // rejects after connectionTimeoutMillis instead of waiting for ever.
    const pool = new pg.Pool({ connectionString: testEnv.databaseUrl, max: 1, connectionTimeoutMillis: 300 });
    const held = await pool.connect();
    try {
      const started = Date.now();
      const error = await pool.connect().then(
        () => null,
        (e: unknown) => e,
      );
      expect(error).toBeInstanceOf(Error);
      expect(Date.now() - started).toBeLessThan(5_000);
      const app = toAppError(error);
      expect(app.status).toBe(503);
      expect(app.message).toMatch(/try again/);
    } finally {
      held.release();
      await pool.end();
    }
  });
});
