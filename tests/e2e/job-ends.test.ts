import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer, signedIn } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import type { TestClient } from "../support/http";
import { draftOf, finishAtBench, jobState, payThrough, sendLines } from "../fixtures/bench-flow";
import { createJob } from "../integration/bench-fixtures";
import { createCertificate, stopQueue } from "../integration/certificates-fixtures";

// The owner's side of two paths that must reach their end: a warranty job from the claim to its own
// certificate, and a scope change while the set is on the bench.

let browser: Browser;
let tech: TestClient;
beforeAll(async () => {
  browser = await launchBrowser();
  tech = await signedIn(DEMO.tech);
});
afterAll(async () => {
  await browser?.close();
  await stopQueue();
  await closeTestPool();
});

describe("a warranty job, from the claim to its certificate", () => {
  it("asks nothing of the owner, moves on by itself and ends with a certificate naming the one it answers", async () => {
    const original = await createCertificate();
    const mira = await signedIn(DEMO.customer);
    const { claim } = (await (
      await mira.post("/api/claims", {
        symptomCategory: "hum",
        description: "A hum comes up after the set warms up and does not go away.",
        statements: [],
        certificateId: original.certificateId,
      })
    ).json()) as { claim: { id: string } };
    const accepted = await tech.post(`/api/claims/${claim.id}/decision`, { decision: "accept", reason: "Our filter capacitor failed." });
    const { warrantyJobId: jobId } = (await accepted.json()) as { warrantyJobId: string };
    await sendLines(tech, jobId, (await draftOf(tech, jobId)).lines);

    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, DEMO.customer.email, DEMO.customer.password);
    await page.goto(`/portal/jobs/${jobId}`);
    await expect.poll(() => page.getByText("No charge (warranty)").count()).toBeGreaterThan(0);
    await snap(page, "job-ends-01-warranty-estimate");
    await page.getByRole("button", { name: /Approve this estimate/ }).click();
    const next = page.locator('section[aria-labelledby="next-title"]');
    await expect.poll(() => next.getByText(/Nothing to pay before the work/).count(), { timeout: 15_000 }).toBe(1);
    expect(await page.getByRole("button", { name: /Pay the/ }).count()).toBe(0);

    const done = await finishAtBench(tech, jobId);
    expect(done.movedOn).toBe(true);
    expect(await jobState(jobId)).toBe("paid_in_full");
    await page.reload();
    // Paid in full, the set is still at the shop (the state table's next move is the return): nothing may
    // say it is on its way.
    await expect.poll(() => page.getByTestId("job-state").textContent()).toMatch(/Paid in full — being made ready to return/);
    expect(await page.getByText(/on its way|back with you/).count()).toBe(0);
    expect(await page.getByRole("button", { name: /Pay the balance/ }).count()).toBe(0);
    await snap(page, "job-ends-02-warranty-nothing-to-pay");

    expect((await tech.post(`/api/bench/jobs/${jobId}/return`, { method: "pick-up" })).status).toBe(200);
    await page.reload();
    await expect.poll(() => page.getByTestId("job-state").textContent()).toMatch(/Collected — back with you/);
    const [cert] = await sql<{ code: string }>("select code from certificate where job_id = $1", [jobId]);
    await page.goto(`/verify/${cert!.code}`);
    await expect.poll(() => page.getByTestId("answers").textContent()).toContain(original.code);
    await snap(page, "job-ends-03-warranty-certificate");
    await ctx.close();
  });
});

describe("a scope change at the bench, from the owner's side", () => {
  it("shows the change with the set staying on the bench, no deposit, and goes back to the bench on approval", async () => {
    const { client: owner, email, password } = await newCustomer("bench-owner");
    const { jobId } = await createJob({ customerEmail: email, state: "in_triage", technicianEmail: DEMO.tech.email });
    const lines = (await draftOf(tech, jobId)).lines;
    const rev1 = await sendLines(tech, jobId, lines);
    expect((await owner.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId: rev1.id })).status).toBe(200);
    await payThrough(owner, jobId, "deposit", "deposit_paid");
    expect((await tech.post(`/api/bench/jobs/${jobId}/start-bench`)).status).toBe(200);
    const extra = {
      ...lines.find((l) => l.kind === "labour")!,
      key: "mech.dial-cord",
      code: "mech.dial-cord",
      title: "Restring the dial cord",
      category: "mechanical",
      minutes: 45,
      reason: "The dial cord parted during alignment.",
      readings: [],
    };
    await sendLines(tech, jobId, [...lines, extra], "The dial cord parted during alignment and must be restrung.");

    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, email, password);
    await page.goto(`/portal/jobs/${jobId}`);
    await expect.poll(() => page.getByTestId("job-state").textContent()).toMatch(/stays on the bench/);
    expect(await page.getByText("Deposit to start the work").count()).toBe(0);
    // Not asked to send the set in (where it goes back afterwards may be shown: "send the set back").
    expect(await page.getByText(/send the set(?! back)|send or bring the set/i).count()).toBe(0);
    expect(await page.getByText("Restring the dial cord").count()).toBeGreaterThan(0);
    await snap(page, "job-ends-04-bench-change");
    await page.getByRole("button", { name: /Approve the change/ }).click();
    await expect.poll(() => page.getByTestId("job-state").textContent(), { timeout: 15_000 }).toMatch(/^.?On the bench$/);
    expect(await jobState(jobId)).toBe("on_bench");
    expect(await page.getByRole("button", { name: /Pay the deposit/ }).count()).toBe(0);
    await snap(page, "job-ends-05-bench-change-approved");
    await ctx.close();
  });
});
