import { randomUUID } from "node:crypto";
import fc from "fast-check";
import type Stripe from "stripe";
import { afterAll, describe, expect, it } from "vitest";
import { transaction } from "@/db/transaction";
import { isTerminal, type JobState } from "@/lib/engine/jobs/states";
import { loadJobAccount } from "@/lib/server/services/account";
import { approveRevision, declineRevision } from "@/lib/server/services/approvals";
import {
  beginFinalChecks,
  completeJob,
  recordReturn,
  saveReading,
  setTask,
  startBenchWork,
  getBenchSheet,
} from "@/lib/server/services/bench";
import { getEstimateView, saveDraft, sendRevision } from "@/lib/server/services/estimates";
import { handleStripeEvent } from "@/lib/server/services/payments";
import { db } from "@/db";
import { DEMO } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { createJob, userId } from "./bench-fixtures";
import { stopQueue } from "./certificates-fixtures";

// Random sequences of legal actions on one job — revisions (cheaper or dearer, at any time they are allowed),
// approvals and declines, checkouts paid with their webhooks delivered in any order and more than once — driven
// through the services against the test database. After every step: what is owed and owed back agrees with the
// payment rows, a paid payment never goes back, and a returned job has exactly one certificate. At the end, a
// plain finisher (approve, pay what is asked, do the bench work, return) must bring every job to an end.
// Source for the invariants: common practice of bookkeeping (a job's balance is its total less the money held).

afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

type Action =
  | { kind: "revise"; keep: number }
  | { kind: "approve" }
  | { kind: "decline-keep" }
  | { kind: "open-checkout" }
  | { kind: "deliver"; which: number; event: "completed" | "expired"; times: number }
  | { kind: "bench" }
  | { kind: "finish" };

const action: fc.Arbitrary<Action> = fc.oneof(
  fc.record({ kind: fc.constant("revise" as const), keep: fc.integer({ min: 1, max: 6 }) }),
  fc.constant({ kind: "approve" as const }),
  fc.constant({ kind: "decline-keep" as const }),
  fc.constant({ kind: "open-checkout" as const }),
  fc.record({
    kind: fc.constant("deliver" as const),
    which: fc.nat({ max: 5 }),
    event: fc.constantFrom("completed" as const, "expired" as const),
    times: fc.integer({ min: 1, max: 3 }),
  }),
  fc.constant({ kind: "bench" as const }),
  fc.constant({ kind: "finish" as const }),
);

let tech = "";
let owner = "";

async function jobState(jobId: string): Promise<JobState> {
  const [row] = await sql<{ state: JobState }>("select state from job where id = $1", [jobId]);
  return row!.state;
}

async function latestSent(jobId: string): Promise<string | null> {
  const [row] = await sql<{ id: string }>(
    "select id from estimate_revision where job_id = $1 and status = 'sent' order by revision desc limit 1",
    [jobId],
  );
  return row?.id ?? null;
}

async function revise(jobId: string, keep: number, first = false) {
  const view = await getEstimateView({ jobId });
  const lines = first ? view.lines : view.lines.slice(0, Math.max(1, Math.min(view.lines.length, keep * 3)));
  await transaction(async (ctx) => {
    const { version } = await saveDraft(ctx, { jobId, actorId: tech, version: view.version, lines });
    await sendRevision(ctx, { jobId, actorId: tech, version, changeSummary: first ? null : `Scope now ${lines.length} lines` });
  });
}

// A checkout as startCheckout records it, with a session id the webhook events name (no processor needed).
async function openCheckout(jobId: string): Promise<void> {
  const state = await jobState(jobId);
  const purpose = state === "approved" ? "deposit" : state === "balance_due" ? "balance" : null;
  if (!purpose) return;
  const { account, revision, paidDepositsMinor } = await loadJobAccount(db, jobId);
  if (!revision) return;
  const amount = purpose === "deposit" ? Math.min(revision.depositMinor - paidDepositsMinor, account.owedMinor) : account.owedMinor;
  if (amount <= 0) return;
  await sql(
    `insert into payment (job_id, revision_id, purpose, amount_minor, currency, status, checkout_session_id, idempotency_key)
     values ($1, $2, $3, $4, $5, 'open', $6, $7)`,
    [jobId, revision.id, purpose, amount, revision.currency, `cs_prop_${randomUUID().replace(/-/g, "")}`, `prop:${randomUUID()}`],
  );
}

async function deliver(jobId: string, which: number, type: "completed" | "expired", times: number) {
  const rows = await sql<{
    id: string;
    checkout_session_id: string;
    amount_minor: number;
    currency: string;
    revision_id: string;
    purpose: string;
  }>("select id, checkout_session_id, amount_minor, currency, revision_id, purpose from payment where job_id = $1 order by created_at", [
    jobId,
  ]);
  const p = rows[which % Math.max(rows.length, 1)];
  if (!p) return;
  const session = {
    id: p.checkout_session_id,
    object: "checkout.session",
    amount_total: p.amount_minor,
    currency: p.currency.toLowerCase(),
    payment_status: type === "completed" ? "paid" : "unpaid",
    payment_intent: `pi_${p.id.replace(/-/g, "")}`,
    metadata: { jobId, revisionId: p.revision_id, purpose: p.purpose },
  };
  const event = {
    id: `evt_prop_${p.id.replace(/-/g, "")}_${type}`,
    type: type === "completed" ? "checkout.session.completed" : "checkout.session.expired",
    data: { object: session },
  } as unknown as Stripe.Event;
  for (let i = 0; i < times; i++) await handleStripeEvent(event);
}

async function benchWork(jobId: string) {
  const state = await jobState(jobId);
  await transaction(async (ctx) => {
    if (state === "deposit_paid") await startBenchWork(ctx, { jobId, actorId: tech });
  });
  if (!["deposit_paid", "on_bench", "bench_revision"].includes(state)) return;
  const sheet = await getBenchSheet({ jobId });
  await transaction(async (ctx) => {
    for (const r of sheet.requirements) {
      const value = r.unit === "mA" ? 0.12 : (r.nominal ?? 120);
      await saveReading(ctx, { jobId, actorId: tech, input: { key: r.key, value, note: undefined } });
    }
    for (const t of sheet.tasks) await setTask(ctx, { jobId, actorId: tech, code: t.code, done: true });
  });
}

async function tryStep(fn: () => Promise<unknown>) {
  try {
    await fn();
  } catch (e) {
    // Refusals (409/400) are part of the game: the action was not legal at that moment.
    if (!(e && typeof e === "object" && "status" in e)) throw e;
  }
}

async function step(jobId: string, a: Action) {
  const state = await jobState(jobId);
  const sent = await latestSent(jobId);
  switch (a.kind) {
    case "revise":
      return tryStep(() => revise(jobId, a.keep));
    case "approve":
      if (sent) await tryStep(() => transaction((ctx) => approveRevision(ctx, { jobId, customerId: owner, revisionId: sent })));
      return;
    case "decline-keep":
      if (sent && state === "bench_revision")
        await tryStep(() =>
          transaction((ctx) =>
            declineRevision(ctx, { jobId, customerId: owner, revisionId: sent, reason: "Not this time", afterDecline: "approved-scope" }),
          ),
        );
      return;
    case "open-checkout":
      return openCheckout(jobId);
    case "deliver":
      return deliver(jobId, a.which, a.event, a.times);
    case "bench":
      return tryStep(() => benchWork(jobId));
    case "finish":
      if (state === "on_bench")
        await tryStep(() =>
          transaction(async (ctx) => {
            await beginFinalChecks(ctx, { jobId, actorId: tech });
            await completeJob(ctx, { jobId, actorId: tech });
          }),
        );
      if (state === "paid_in_full")
        await tryStep(() => transaction((ctx) => recordReturn(ctx, { jobId, actorId: tech, input: { method: "pick-up" } })));
      return;
  }
}

async function checkInvariants(jobId: string, paidBefore: Set<string>) {
  const { account } = await loadJobAccount(db, jobId);
  const [sums] = await sql<{ paid: string; refunded: string; total: string | null; settled: number | null }>(
    `select coalesce((select sum(amount_minor) from payment where job_id = $1 and status = 'paid'), 0) as paid,
            coalesce((select sum(f.amount_minor) from refund f join payment p on p.id = f.payment_id where p.job_id = $1 and f.status <> 'failed'), 0) as refunded,
            (select total_minor from estimate_revision where job_id = $1 and status = 'approved' order by revision desc limit 1) as total,
            (select settled_total_minor from job where id = $1) as settled`,
    [jobId],
  );
  const total = sums!.settled ?? Number(sums!.total ?? 0);
  const held = Number(sums!.paid) - Number(sums!.refunded);
  // Exactly one of owed / owed back can be non-zero, and their difference is total − held.
  expect(account.owedMinor * account.owedBackMinor).toBe(0);
  expect(account.owedMinor - account.owedBackMinor).toBe(total - held);
  const paidNow = new Set(
    (await sql<{ id: string }>("select id from payment where job_id = $1 and status = 'paid'", [jobId])).map((r) => r.id),
  );
  for (const id of paidBefore) expect(paidNow.has(id), "a paid payment went back").toBe(true);
  const certs = await sql("select 1 from certificate where job_id = $1 and superseded_by_id is null", [jobId]);
  expect(certs.length).toBe((await jobState(jobId)) === "returned" ? 1 : 0);
  return paidNow;
}

// The plain finisher: whatever the sequence left, an owner who approves and pays, a bench that works and
// returns the set, bring the job to an end.
async function finish(jobId: string) {
  for (let i = 0; i < 12 && !isTerminal(await jobState(jobId)); i++) {
    await step(jobId, { kind: "approve" });
    const state = await jobState(jobId);
    if (state === "approved" || state === "balance_due") {
      await openCheckout(jobId);
      const [n] = await sql<{ n: string }>("select count(*) as n from payment where job_id = $1", [jobId]);
      await deliver(jobId, Number(n!.n) - 1, "completed", 1);
    }
    await step(jobId, { kind: "bench" });
    await step(jobId, { kind: "finish" });
  }
}

describe("random sequences of legal actions", () => {
  it("keep the account, the payments and the certificates straight, and always reach an end", async () => {
    tech = await userId(DEMO.tech.email);
    owner = await userId(DEMO.customer.email);
    await fc.assert(
      fc.asyncProperty(fc.array(action, { minLength: 3, maxLength: 14 }), async (actions) => {
        const { jobId } = await createJob({ state: "in_triage", technicianEmail: DEMO.tech.email });
        await revise(jobId, 6, true);
        let paid = new Set<string>();
        for (const a of actions) {
          await step(jobId, a);
          paid = await checkInvariants(jobId, paid);
        }
        await finish(jobId);
        paid = await checkInvariants(jobId, paid);
        expect(isTerminal(await jobState(jobId))).toBe(true);
      }),
      { numRuns: 12 },
    );
  }, 240_000);
});
