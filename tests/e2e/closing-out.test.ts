import { randomUUID } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { axeViolations, describeViolations } from "../support/axe";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { testEnv } from "../support/env";
import { TestClient } from "../support/http";
import { waitForMail } from "../support/mail";
import { createJob } from "../integration/bench-fixtures";
import { loseNextProcessorReplies, paidPaymentWithCharge } from "../integration/office-fixtures";

// Where people see the unusual endings: the shop owner finds refunds whose outcome is not known yet and
// e-mail that could not be sent; a set owner withdraws a request the shop has not started.

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

async function noAxeViolations(page: Page) {
  const violations = await axeViolations(page);
  expect(violations, `${page.url()}\n${describeViolations(violations)}`).toEqual([]);
}

describe("the office sees what did not finish by itself", () => {
  it("finds a pending refund and settles it by checking with the processor", async () => {
    const api = await signedIn(DEMO.owner);
    const { paymentId, paymentIntentId } = await paidPaymentWithCharge(7700);
    await loseNextProcessorReplies(paymentIntentId, 2, { holdEvents: true });
    const res = await api.post(`/api/office/payments/${paymentId}/refunds`, { amount: "17.00", reason: "Cabinet scratch we caused" });
    expect(((await res.json()) as { status: string }).status).toBe("pending");

    const page = await (await newContext(browser)).newPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office");
    const listed = page.getByTestId("open-refunds").getByRole("link", { name: /USD 17\.00/ });
    await expect.poll(() => listed.count()).toBe(1);
    expect(await page.getByText("Pending — outcome not known yet").count()).toBeGreaterThan(0);
    await snap(page, "closing-01-office-pending-refund");
    await noAxeViolations(page);

    await page.locator(`a[href="/office/payments/${paymentId}"]`).first().click();
    await page.waitForURL(new RegExp(`/office/payments/${paymentId}$`));
    await page.getByRole("button", { name: "Check with the processor" }).click();
    await expect.poll(() => page.getByTestId("refunded-so-far").textContent()).toBe("USD 17.00");
    await expect.poll(() => page.getByRole("cell", { name: /Refunded/ }).count()).toBe(1);
    await noAxeViolations(page);
    await page.context().close();
  });

  it("lists an e-mail that could not be sent and sends it again", async () => {
    const email = `bounce-${randomUUID().slice(0, 8)}@example.com`;
    await fetch(`${testEnv.mailUrl}/control/reject?${new URLSearchParams({ to: email })}`, { method: "POST" });
    expect((await new TestClient().signUp("Test bounce", email, "tuning-fork-552")).ok).toBe(true);
    await expect
      .poll(async () => (await sql<{ status: string }>("select status from email_outbox where to_address = $1", [email]))[0]?.status)
      .toBe("failed");

    const page = await (await newContext(browser)).newPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office");
    const row = page.getByRole("row", { name: new RegExp(email) });
    await expect.poll(() => row.count()).toBe(1);
    expect(await row.getByText(/Refused by the mail provider/).count()).toBe(1);
    await snap(page, "closing-02-office-failed-mail");
    await noAxeViolations(page);

    await fetch(`${testEnv.mailUrl}/control/reject?${new URLSearchParams({ to: email, off: "1" })}`, { method: "POST" });
    const started = Date.now();
    // The list is in the first paint; the button works once the page has hydrated.
    await page.waitForLoadState("networkidle");
    await row.getByRole("button", { name: `Send again to ${email}` }).click();
    await expect.poll(() => page.getByText(`The message to ${email} is queued again.`).count()).toBe(1);
    await waitForMail(email, "Confirm your e-mail", { after: started - 1000 });
    await page.context().close();
  });
});

describe("a set owner withdraws a request", () => {
  it("withdraws a request the shop has not started, after saying yes", async () => {
    const { jobId } = await createJob({ state: "requested" });
    const page = await (await newContext(browser)).newPage();
    await signInPage(page, DEMO.customer.email, DEMO.customer.password);
    await page.goto(`/portal/jobs/${jobId}`);
    await page.getByRole("button", { name: "Withdraw this request" }).click();
    await page.getByLabel(/Why/).fill("Sold the set to a collector.");
    await snap(page, "closing-03-withdraw-confirm");
    await noAxeViolations(page);
    await page.getByRole("button", { name: "Yes, withdraw my request" }).click();
    await expect.poll(() => page.getByTestId("job-state").textContent()).toContain("Cancelled");
    expect(await page.getByRole("button", { name: "Withdraw this request" }).count()).toBe(0);
    const [job] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    expect(job!.state).toBe("cancelled");
    await page.context().close();
  });
});
