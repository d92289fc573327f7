import { afterAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { createJob } from "./bench-fixtures";
import { insertJob, paidPaymentWithCharge, processorRefunds, waitFor } from "./office-fixtures";

// Calling a job off before the bench. The rule of the trade checked here (common practice for a repair shop):
// a job cancelled by the shop before any work owes the owner back everything they paid, and nothing more.

afterAll(async () => {
  await closeTestPool();
});

async function stateOf(jobId: string) {
  const [row] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
  return row!.state;
}

describe("the owner withdraws a quote request", () => {
  it("withdraws a request nobody has started, and only that", async () => {
    const owner = await signedIn(DEMO.customer);
    const { jobId } = await createJob({ state: "requested" });
    for (const who of [DEMO.customer2, DEMO.tech]) {
      expect((await (await signedIn(who)).post(`/api/portal/jobs/${jobId}/withdraw`, {})).status, who.email).toBe(404);
    }
    const res = await owner.post(`/api/portal/jobs/${jobId}/withdraw`, { reason: "Found the fault myself: a loose valve." });
    expect(res.status).toBe(200);
    expect(await stateOf(jobId)).toBe("cancelled");
    const [h] = await sql<{ from_state: string; actor_id: string }>(
      "select from_state, actor_id from job_state_history where job_id = $1 and to_state = 'cancelled'",
      [jobId],
    );
    expect(h!.from_state).toBe("requested");
    const [m] = await sql<{ body: string }>("select body from message where job_id = $1", [jobId]);
    expect(m!.body).toContain("loose valve");
    const again = await owner.post(`/api/portal/jobs/${jobId}/withdraw`, {});
    expect(again.status).toBe(409);

    const started = await createJob({ state: "in_triage" });
    const late = await owner.post(`/api/portal/jobs/${started.jobId}/withdraw`, {});
    expect(late.status).toBe(409);
    expect(((await late.json()) as { error: { message: string } }).error.message).toMatch(/before the shop starts/);
    expect(await stateOf(started.jobId)).toBe("in_triage");
  });
});

describe("the shop cancels a job before the bench", () => {
  it("cancels a job with a paid deposit and refunds everything paid", async () => {
    const shop = await signedIn(DEMO.owner);
    const { jobId, paymentId, paymentIntentId } = await paidPaymentWithCharge(4200);
    expect(await stateOf(jobId)).toBe("deposit_paid");
    const res = await shop.post(`/api/bench/jobs/${jobId}/cancel`, { reason: "The replacement dial glass cannot be had." });
    expect(res.status).toBe(200);
    const body = (await res.json()) as {
      state: string;
      account: { paidMinor: number; refundPendingMinor: number; refundedMinor: number };
      refunds: { paymentId: string; amountMinor: number }[];
    };
    expect(body.state).toBe("cancelled");
    expect(body.refunds).toEqual([expect.objectContaining({ paymentId, amountMinor: 4200 })]);
    expect(body.account.paidMinor).toBe(4200);
    expect(body.account.refundPendingMinor + body.account.refundedMinor).toBe(4200);
    await waitFor(async () => {
      const [p] = await sql<{ refunded_minor: number }>("select refunded_minor from payment where id = $1", [paymentId]);
      return p!.refunded_minor === 4200;
    });
    expect((await processorRefunds(paymentIntentId)).map((r) => r.amount)).toEqual([4200]);
    const [m] = await sql<{ body: string; internal: boolean }>("select body, internal from message where job_id = $1", [jobId]);
    expect(m).toEqual({ body: "The shop has cancelled this job: The replacement dial glass cannot be had.", internal: false });
  });

  it("can leave the money shown as owed back instead of refunding at once", async () => {
    const shop = await signedIn(DEMO.owner);
    const { jobId } = await paidPaymentWithCharge(1800);
    const res = await shop.post(`/api/bench/jobs/${jobId}/cancel`, { reason: "Owner asked by phone to stop.", refund: false });
    expect(res.status).toBe(200);
    const body = (await res.json()) as { owedBackMinor: number; refunds: unknown[] };
    expect(body).toMatchObject({ owedBackMinor: 1800, refunds: [] });
    expect((await sql("select 1 from refund r join payment p on p.id = r.payment_id where p.job_id = $1", [jobId])).length).toBe(0);
  });

  it("refuses once the set is on the bench, and is the shop owner's alone", async () => {
    const shop = await signedIn(DEMO.owner);
    const { jobId } = await insertJob({ state: "on_bench" });
    const res = await shop.post(`/api/bench/jobs/${jobId}/cancel`, { reason: "Too late for this." });
    expect(res.status).toBe(409);
    expect(await stateOf(jobId)).toBe("on_bench");
    const early = await insertJob({ state: "estimate_sent" });
    const tech = await signedIn(DEMO.tech);
    expect((await tech.post(`/api/bench/jobs/${early.jobId}/cancel`, { reason: "Not my call to make." })).status).toBe(404);
    const short = await shop.post(`/api/bench/jobs/${early.jobId}/cancel`, { reason: "no" });
    expect(short.status).toBe(400);
    const ok = await shop.post(`/api/bench/jobs/${early.jobId}/cancel`, { reason: "Parts no longer made." });
    expect(ok.status).toBe(200);
    expect(((await ok.json()) as { owedBackMinor: number }).owedBackMinor).toBe(0);
  });
});
