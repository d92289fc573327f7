import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import type { TestClient } from "../support/http";
import { waitForMail } from "../support/mail";
import { payOnStandin, sessionIdFrom, stripeClient } from "../fixtures/stripe";
import { createJob, userId } from "./bench-fixtures";
import { stopQueue } from "./certificates-fixtures";

// A scope change at the bench, approved after the deposit was paid, can leave a balance that is a positive
// amount below the processor's smallest charge: USD 0.50, i.e. 50 minor units (published: Stripe API
// documentation, REFERENCES.md "Payments"). The owner cannot pay that online, so the shop waives it when the
// balance falls due and the job reaches its end; nothing more than is owed is ever asked.

const MINIMUM = 50;

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

async function save(jobId: string, lines: DraftLine[]): Promise<{ version: number; totalMinor: number }> {
  const { version } = await draft(jobId);
  const saved = await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version, lines } });
  expect(saved.status, await saved.clone().text()).toBe(200);
  const body = (await saved.json()) as { version: number; totals: { totalMinor: number } };
  return { version: body.version, totalMinor: body.totals.totalMinor };
}

async function send(jobId: string, version: number, changeSummary?: string) {
  const sent = await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version, ...(changeSummary ? { changeSummary } : {}) });
  expect(sent.status, await sent.clone().text()).toBe(200);
  const [rev] = await sql<{ id: string; total_minor: number; deposit_minor: number }>(
    "select id, total_minor, deposit_minor from estimate_revision where job_id = $1 order by revision desc limit 1",
    [jobId],
  );
  return rev!;
}

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

async function finishAtBench(jobId: string) {
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
  return (await done.json()) as { balanceMinor: number; owedBackMinor: number; waivedMinor?: number; movedOn: boolean };
}

type PortalView = {
  due: { purpose: string; amount: { minor: number } } | null;
  account: {
    owed: { minor: number };
    owedBack: { minor: number };
    paid: { minor: number };
    belowMinimum: boolean;
    waived: { minor: number; text: string } | null;
  };
};
async function portal(owner: TestClient, jobId: string): Promise<PortalView> {
  const res = await owner.get(`/api/portal/jobs/${jobId}`);
  expect(res.status).toBe(200);
  return (await res.json()) as PortalView;
}

/** A new owner's job, estimate approved and its deposit paid through the stand-in: on the bench. */
async function jobOnBench(label: string) {
  const { client: owner, email } = await newCustomer(label);
  const { jobId, number } = await createJob({ customerEmail: email, state: "in_triage", technicianEmail: DEMO.tech.email });
  const first = await draft(jobId);
  const { version } = await save(jobId, first.lines);
  const rev1 = await send(jobId, version);
  expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev1.id })).status).toBe(200);
  expect(await pay(owner, jobId, "deposit", "deposit_paid")).toBe(rev1.deposit_minor);
  expect((await tech.post(`/api/bench/jobs/${jobId}/start-bench`)).status).toBe(200);
  return { owner, email, jobId, number, rev1, lines: first.lines };
}

/**
 * A smaller scope at the bench: a single part line whose cost is adjusted until the revision's total lands
 * strictly between `low` and `high` (the builder prices each try; nothing is sent until it fits).
 */
async function saveScopeBetween(jobId: string, lines: DraftLine[], low: number, high: number) {
  const part = lines.find((l) => l.kind === "part")!;
  const target = Math.floor((low + high) / 2);
  let cost = Math.floor(target / 1.1);
  for (let tries = 0; tries < 12; tries++) {
    const line = {
      ...part,
      quantity: 1,
      unitCost: (cost / 100).toFixed(2),
      markupPercent: "0",
      reason: "Only the dial lamp needed replacing.",
    };
    const saved = await save(jobId, [line]);
    if (saved.totalMinor > low && saved.totalMinor < high) return saved;
    cost += Math.sign(target - saved.totalMinor) * Math.max(1, Math.floor(Math.abs(target - saved.totalMinor) / 2));
  }
  throw new Error("no part cost puts the total in range");
}

describe("a balance below the processor's minimum after a scope change at the bench", () => {
  it("is waived when the balance falls due, recorded and audited, and the job moves on as paid", async () => {
    const { owner, email, jobId, number, rev1, lines } = await jobOnBench("below-minimum");
    const deposit = rev1.deposit_minor;
    // The new total is the deposit plus a few cents: a remainder between 1 and 49 minor units.
    const saved = await saveScopeBetween(jobId, lines, deposit, deposit + MINIMUM);
    const rev2 = await send(jobId, saved.version, "Only the dial lamp needed replacing; the rest of the work is not needed.");
    const remainder = rev2.total_minor - deposit;
    expect(remainder).toBeGreaterThan(0);
    expect(remainder).toBeLessThan(MINIMUM);
    expect(await state(jobId)).toBe("bench_revision");
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev2.id })).status).toBe(200);
    expect(await state(jobId)).toBe("on_bench");
    // Nothing is asked at the bench; the few cents show as still to pay until the work is done.
    const onBench = await portal(owner, jobId);
    expect(onBench.account.owed.minor).toBe(remainder);
    expect(onBench.account.belowMinimum).toBe(true);

    const t0 = Date.now() - 50;
    const done = await finishAtBench(jobId);
    // Old behaviour: "balance due" for ever, the checkout refused by the processor (amount too small).
    expect(done).toMatchObject({ balanceMinor: 0, owedBackMinor: 0, waivedMinor: remainder, movedOn: true });
    expect(await state(jobId)).toBe("paid_in_full");

    const techId = await userId(DEMO.tech.email);
    const [job] = await sql<{ waived_minor: number; waived_by: string | null; waived_at: Date | null }>(
      "select waived_minor, waived_by, waived_at from job where id = $1",
      [jobId],
    );
    expect(job).toMatchObject({ waived_minor: remainder, waived_by: techId });
    expect(job!.waived_at).toBeInstanceOf(Date);
    const audits = await sql<{ actor_id: string; after: { waivedMinor: number; processorMinimumMinor: number } }>(
      "select actor_id, after from audit_event where entity_id = $1 and action = 'account.waive_below_minimum'",
      [jobId],
    );
    expect(audits).toHaveLength(1);
    expect(audits[0]).toMatchObject({ actor_id: techId, after: { waivedMinor: remainder, processorMinimumMinor: MINIMUM } });
    const [move] = await sql<{ note: string }>(
      "select note from job_state_history where job_id = $1 and from_state = 'balance_due' and to_state = 'paid_in_full'",
      [jobId],
    );
    expect(move!.note).toContain("waived, below the smallest card payment");

    // The owner sees it named, owes nothing, and is owed nothing back; no checkout can be opened.
    const view = await portal(owner, jobId);
    expect(view.account.waived?.minor).toBe(remainder);
    expect(view.account.owed.minor).toBe(0);
    expect(view.account.owedBack.minor).toBe(0);
    expect(view.account.belowMinimum).toBe(false);
    expect(view.due).toBeNull();
    const checkout = await owner.post("/api/payments/checkout", { jobId, purpose: "balance" });
    expect(checkout.status).toBe(409);
    const mail = await waitForMail(email, `is finished (KL-${String(number).padStart(4, "0")})`, { after: t0 });
    expect(mail.text).toMatch(/below the smallest card payment/);
    // Never charged more than owed: the only money taken is the deposit.
    const paid = await sql<{ amount_minor: number }>("select amount_minor from payment where job_id = $1 and status = 'paid'", [jobId]);
    expect(paid.map((p) => p.amount_minor)).toEqual([deposit]);
    // The page the owner reads says so in words.
    const page = await (await owner.get(`/portal/jobs/${jobId}`)).text();
    expect(page).not.toContain("Pay the balance");

    expect((await tech.post(`/api/bench/jobs/${jobId}/return`, { method: "pick-up" })).status).toBe(200);
    expect(await state(jobId)).toBe("returned");
  });

  it("waives nothing early: a second revision that raises the total again is collected in full", async () => {
    const { owner, jobId, rev1, lines } = await jobOnBench("below-minimum-twice");
    const deposit = rev1.deposit_minor;
    const saved = await saveScopeBetween(jobId, lines, deposit, deposit + MINIMUM);
    const rev2 = await send(jobId, saved.version, "Only the dial lamp needed replacing.");
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev2.id })).status).toBe(200);
    // Then the original scope after all: the balance is the full total less the deposit, chargeable.
    const back = await save(jobId, lines);
    const rev3 = await send(jobId, back.version, "The filter capacitors failed after all: back to the full recap.");
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev3.id })).status).toBe(200);
    const done = await finishAtBench(jobId);
    expect(done).toMatchObject({ balanceMinor: rev3.total_minor - deposit, movedOn: false });
    expect(await pay(owner, jobId, "balance", "paid_in_full")).toBe(rev3.total_minor - deposit);
    const [job] = await sql<{ waived_minor: number }>("select waived_minor from job where id = $1", [jobId]);
    expect(job!.waived_minor).toBe(0);
    expect((await portal(owner, jobId)).account.waived).toBeNull();
  });
});
