import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { newCustomer } from "../support/accounts";
import { launchBrowser, newContext, PHONE, signInPage, snap } from "../support/browser";
import { sql } from "../support/db";
import { seedJobWithEstimate } from "../fixtures/jobs";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** Nothing on the page is wider than the viewport (a sideways scroll on a phone is a defect). */
async function overflow(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
}

async function fillAddress(
  page: Page,
  scope: string,
  values: { country: string; line1: string; city: string; region?: string; postalCode: string },
) {
  const form = page.getByRole("form", { name: scope });
  await form.getByLabel("Country").selectOption(values.country);
  await form.getByLabel("Street and number").fill(values.line1);
  await form.getByLabel(/^(City|Town or city)$/).fill(values.city);
  if (values.region) await form.getByLabel(/^(State|Province or territory)$/).selectOption(values.region);
  await form.getByLabel(/^(ZIP code|Postal code|Postcode)/).fill(values.postalCode);
}

for (const device of [
  { name: "desktop", options: undefined },
  { name: "phone", options: PHONE },
] as const) {
  describe(`the account page on a ${device.name}`, () => {
    it("is reached from the portal's navigation, keeps addresses by country and chooses a job's return address", async () => {
      const owner = await newCustomer(`acct-${device.name}`);
      const job = await seedJobWithEstimate({ email: owner.email, state: "deposit_paid" });
      const context = await newContext(browser, device.options);
      const page = await context.newPage();
      await signInPage(page, owner.email, owner.password);

      await page.getByRole("navigation", { name: "My sets sections" }).getByRole("link", { name: "My account" }).click();
      await page.waitForURL(/\/portal\/account$/);
      await expect.poll(() => page.getByRole("heading", { name: "My account", exact: true }).count()).toBe(1);
      expect(await overflow(page)).toBeLessThanOrEqual(0);

      // A wrong ZIP code is refused in the form, naming the field (USPS: 5 digits or ZIP+4, from memory).
      await fillAddress(page, "New address", {
        country: "US",
        line1: "14 Kestrel Lane",
        city: "Port Alder",
        region: "ME",
        postalCode: "0410",
      });
      await page.getByRole("button", { name: "Add address" }).click();
      await expect.poll(() => page.getByText(/^ZIP code: enter 5 digits or ZIP\+4/).count()).toBe(1);
      await page
        .getByRole("form", { name: "New address" })
        .getByLabel(/^ZIP code/)
        .fill("04101");
      await page.getByRole("button", { name: "Add address" }).click();
      await expect.poll(() => page.getByTestId("address").count()).toBe(1);
      await expect.poll(() => page.getByText("PORT ALDER, ME 04101").count()).toBe(1);

      // A Canadian address: the province list and the postal code follow the country (Canada Post, from memory).
      await page.getByRole("button", { name: "Add an address" }).click();
      await fillAddress(page, "New address", {
        country: "CA",
        line1: "24 Sussex Drive",
        city: "Ottawa",
        region: "ON",
        postalCode: "k1m1m4",
      });
      await page.getByRole("button", { name: "Add address" }).click();
      await expect.poll(() => page.getByText("OTTAWA ON K1M 1M4").count()).toBe(1);
      await snap(page, `owner-account-${device.name}-addresses`);
      expect(await overflow(page)).toBeLessThanOrEqual(0);

      // The job page preselects the default address and keeps the choice.
      await page.goto(`/portal/jobs/${job.jobId}`);
      await expect.poll(() => page.getByRole("heading", { name: "Where we send the set back" }).count()).toBe(1);
      await page.getByRole("button", { name: "Ship it back here" }).click();
      await expect.poll(() => page.getByTestId("return-address").count()).toBe(1);
      await expect.poll(() => page.getByTestId("return-address").innerText()).toContain("PORT ALDER, ME 04101");
      const [stored] = await sql<{ return_address: { city: string } | null }>("select return_address from job where id = $1", [job.jobId]);
      expect(stored!.return_address?.city).toBe("Port Alder");
      await snap(page, `owner-account-${device.name}-job-return-address`);
      expect(await overflow(page)).toBeLessThanOrEqual(0);

      // Closing is refused while that job is open: the page names it and keeps the button off.
      await page.goto("/portal/account");
      await expect.poll(() => page.getByTestId("open-jobs").innerText()).toMatch(/KL-\d{4}/);
      expect(await page.getByRole("button", { name: "Close my account" }).isDisabled()).toBe(true);
      await snap(page, `owner-account-${device.name}-close-refused`);
      await context.close();
    });
  });
}

describe("closing an account from the page", () => {
  it("signs the owner out and leaves the account closed", async () => {
    const owner = await newCustomer("acct-close");
    const context = await newContext(browser, PHONE);
    const page = await context.newPage();
    await signInPage(page, owner.email, owner.password);
    await page.goto("/portal/account");
    await page.getByLabel("Your password, to confirm").fill(owner.password);
    await page.getByRole("button", { name: "Close my account" }).click();
    await expect.poll(() => page.getByText(/^Confirmation: /).count()).toBe(1);
    await page.getByLabel(/I understand what the shop keeps/).check();
    await page.getByRole("button", { name: "Close my account" }).click();
    await page.waitForURL((u) => u.pathname === "/");
    await page.goto("/portal/account");
    await page.waitForURL(/\/sign-in/);
    const [u] = await sql<{ closed_at: Date | null }>(
      `select closed_at from "user" where email like 'closed-%' and closed_at is not null order by closed_at desc limit 1`,
    );
    expect(u!.closed_at).not.toBeNull();
    await context.close();
  });
});
