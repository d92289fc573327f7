import { join } from "node:path";
import type { Browser, Locator, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { axeViolations, describeViolations } from "../support/axe";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { sql } from "../support/db";
import { testEnv } from "../support/env";
import type { TestClient } from "../support/http";
import { paidPaymentWithCharge } from "../integration/office-fixtures";

let browser: Browser;

async function noAxeViolations(page: Page) {
  const violations = await axeViolations(page);
  expect(violations, `${page.url()}\n${describeViolations(violations)}`).toEqual([]);
}

// Fills a field and checks it holds exactly the value (a fill racing the page's hydration can append instead).
async function fill(field: Locator, value: string) {
  await expect
    .poll(async () => {
      await field.fill(value);
      return field.inputValue();
    })
    .toBe(value);
}

let api: TestClient;
let original: { values: Record<string, unknown> };

beforeAll(async () => {
  browser = await launchBrowser();
  api = await signedIn(DEMO.owner);
  original = (await (await api.get("/api/office/settings")).json()) as typeof original;
});
afterAll(async () => {
  // The shop goes back to its seeded identity for the other tests.
  const now = (await (await api.get("/api/office/settings")).json()) as { version: number };
  await api.request("/api/office/settings", { method: "PUT", json: { ...original.values, version: now.version } });
  await browser?.close();
});

describe("the shop owner runs the office", () => {
  it("edits settings, is stopped from a careless full warranty, and keeps both edits visible when someone saved first", async () => {
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office/settings");
    await expect.poll(() => page.getByRole("heading", { name: "Rates & policy" }).count()).toBe(1);
    // The form fills its fields as it starts in the browser: wait for that, then read them.
    await expect.poll(() => page.getByLabel("Labour rate").inputValue()).toBe("90.00");
    expect(await page.getByLabel("Tax on parts").inputValue()).toBe("8.00");
    await snap(page, "office-01-settings");
    await noAxeViolations(page);

    await fill(page.getByLabel("Phone"), "+1 555 0177");
    await page.getByLabel(/Full warranty/).check();
    await expect.poll(() => page.getByText("Calling it a full warranty is a promise").count()).toBe(1);
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect.poll(() => page.getByText(/Confirm that these terms meet the minimum standards/).count()).toBeGreaterThan(0);
    await snap(page, "office-02-full-warranty-refused");
    await noAxeViolations(page);
    await page.getByLabel(/Limited warranty/).check();
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect.poll(() => page.getByText(/^Saved at/).count()).toBe(1);
    const [row] = await sql<{ phone: string; designation: string }>(
      `select phone, policy->'warranty'->>'designation' as designation from shop_settings where id = 'shop'`,
    );
    expect(row).toEqual({ phone: "+1 555 0177", designation: "limited" });

    // A second tab saves first; the first tab's save is refused and its edits stay in the form.
    const other = await ctx.newPage();
    await other.goto("/office/settings");
    await fill(other.getByLabel("Phone"), "+1 555 0188");
    await other.getByRole("button", { name: "Save settings" }).click();
    await expect.poll(() => other.getByText(/^Saved at/).count()).toBe(1);

    await fill(page.getByLabel("Labour rate"), "92.50");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect.poll(() => page.getByText("Someone else saved first").count()).toBe(1);
    expect(await page.getByLabel("Labour rate").inputValue()).toBe("92.50");
    await snap(page, "office-03-stale-save");
    await page.screenshot({ path: join(testEnv.artifacts, "screenshots", "office-03b-stale-notice.png") });
    await page.getByRole("button", { name: "Save my version over theirs" }).click();
    await expect.poll(() => page.getByText(/^Saved at/).count()).toBe(1);
    const [after] = await sql<{ rate: number; phone: string }>(
      `select (policy->>'labourRateMinorPerHour')::int as rate, phone from shop_settings where id = 'shop'`,
    );
    expect(after).toEqual({ rate: 9250, phone: "+1 555 0177" });
    await ctx.close();
  });

  it("refunds part of a payment and sees it confirmed", async () => {
    const { paymentId } = await paidPaymentWithCharge(15_000);
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office/payments?status=paid");
    await snap(page, "office-04-payments");
    await noAxeViolations(page);
    await page.locator(`a[href="/office/payments/${paymentId}"]`).click();
    await page.waitForURL(new RegExp(`/office/payments/${paymentId}$`));
    await fill(page.getByLabel(/Amount to refund/), "200.00");
    await fill(page.getByLabel("Reason"), "Customer kept the original cord");
    // The kind is asked, never assumed: a return and a price reduction mean different things for the account.
    await page.getByRole("button", { name: "Refund this amount" }).click();
    await expect.poll(() => page.getByText(/^Kind: choose whether/).count()).toBe(1);
    await page.getByLabel("Lower the price (goodwill) and give that back").check();
    await page.getByRole("button", { name: "Refund this amount" }).click();
    await page.getByRole("button", { name: "Yes, refund USD 200.00" }).click();
    await expect.poll(() => page.getByText(/At most USD 150\.00/).count()).toBeGreaterThan(0);
    await fill(page.getByLabel(/Amount to refund/), "35.00");
    await page.getByRole("button", { name: "Refund this amount" }).click();
    // Nothing is sent until the owner confirms a message that names the amount, the customer and the e-mail.
    const confirm = page.getByRole("alertdialog");
    await expect
      .poll(() => confirm.textContent())
      .toMatch(
        /Refund USD 35\.00 of .+'s payment for job KL-\d+, lowering the price by that amount\? A refund cannot be undone\. We e-mail/,
      );
    const [before] = await sql<{ n: number }>("select count(*)::int as n from refund where payment_id = $1", [paymentId]);
    expect(before!.n).toBe(0);
    await page.getByRole("button", { name: "Yes, refund USD 35.00" }).click();
    await expect.poll(() => page.getByText(/Refund of USD 35\.00 sent to the processor/).count()).toBe(1);
    await expect.poll(() => page.getByTestId("refunded-so-far").textContent(), { timeout: 20_000 }).toBe("USD 35.00");
    await expect.poll(() => page.getByRole("cell", { name: /Refunded/ }).count()).toBe(1);
    await snap(page, "office-05-refund-confirmed");
    await noAxeViolations(page);
    await ctx.close();
  });

  it("reads the audit log and the reports", async () => {
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office/audit");
    await page.getByLabel("Action").selectOption("settings.update");
    await page.getByRole("button", { name: "Show" }).click();
    await page.waitForURL(/action=settings\.update/);
    // Read as sentences with fields in words; the stored names stay behind a "Details" disclosure.
    expect(await page.getByRole("cell", { name: /changed the shop's rates and policy/ }).count()).toBeGreaterThan(0);
    expect(await page.getByText("Policy labour rate per hour").count()).toBeGreaterThan(0);
    expect(await page.getByText("policy.labourRateMinorPerHour").count()).toBe(0);
    await snap(page, "office-06-audit");
    await noAxeViolations(page);

    await page.goto("/office/reports");
    await expect.poll(() => page.locator(".recharts-surface").count()).toBeGreaterThanOrEqual(3);
    expect(await page.getByRole("table").count()).toBe(3);
    await snap(page, "office-07-reports");
    await noAxeViolations(page);

    await page.goto("/office");
    await snap(page, "office-08-overview");
    await noAxeViolations(page);
    await ctx.close();
  });
});
