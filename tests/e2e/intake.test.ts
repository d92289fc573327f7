import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { sql } from "../support/db";
import { launchBrowser, newContext, PHONE, signInPage, snap } from "../support/browser";
import { jpegWithGps } from "../fixtures/images";

// The intake page at a desk and on a phone. 390 CSS pixels is a common phone width (from memory of current
// handsets); WCAG 2.2 SC 1.4.10 Reflow asks that a page never scroll sideways at such widths.

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function pageWidth(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth);
}

async function fillSet(page: Page, model: string) {
  await page.getByLabel("Maker").fill("Aurelian");
  await page.getByLabel("Model").fill(model);
  await page.getByLabel("Year (if you know it)").fill("1951");
  await page.getByText("Tube set without a mains transformer (AC/DC)").click();
  await page.getByLabel("Medium wave / AM broadcast (MW)").check();
  await page.getByLabel("What does it do, or not do?").fill("Hums loudly from switch-on and no stations come through.");
  await page.getByLabel("Briefly, to see if it works").check();
  await page.getByLabel("I have told the customer these cautions.").check();
}

describe("taking a set in", () => {
  it("at a desk: a new walk-in kept as a contact, with a counter photo, lands on the job in triage", async () => {
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, DEMO.tech.email, DEMO.tech.password);
    await page.goto("/bench");
    await page.getByRole("link", { name: "Take in a set" }).first().click();
    await page.waitForURL("**/bench/intake");
    await page.getByLabel("A new customer").check();
    // Sending too early names the fields that need answers.
    await page.getByRole("button", { name: "Open the job" }).click();
    await expect.poll(() => page.getByText("Maker: write it as printed on the set.").count()).toBe(1);
    await page.getByLabel("Customer's name").fill("Perrin Ashdown");
    await page.getByLabel("Customer's phone").fill("+1 555 0163");
    await page.getByLabel("Keep them as a contact, without sign-in").check();
    await page.getByLabel("By phone", { exact: true }).nth(1).check();
    await fillSet(page, "Parlour Desk 5");
    await page.locator("#photos").setInputFiles([{ name: "counter.jpg", mimeType: "image/jpeg", buffer: await jpegWithGps() }]);
    await expect.poll(() => page.locator('li[data-status="done"]').count(), { timeout: 60_000 }).toBe(1);
    await snap(page, "intake-01-desktop-filled");
    expect(await pageWidth(page)).toBeLessThanOrEqual(1281);
    await page.getByRole("button", { name: "Open the job" }).click();
    await page.waitForURL(/\/bench\/jobs\/[0-9a-f-]{36}/, { timeout: 30_000 });
    const header = page.locator("header").filter({ hasText: "Parlour Desk 5" });
    await expect.poll(() => header.textContent()).toContain("Taken in at the counter");
    expect(await header.textContent()).toContain("contact without sign-in");
    expect(await header.textContent()).toContain("set at the shop");
    await snap(page, "intake-02-desktop-job");
    const jobId = /jobs\/([0-9a-f-]{36})/.exec(page.url())![1]!;
    const [row] = await sql<{ state: string; photos: number }>(
      "select state, (select count(*)::int from photo where job_id = job.id) as photos from job where id = $1",
      [jobId],
    );
    expect(row).toEqual({ state: "in_triage", photos: 1 });
    await ctx.close();
  });

  it("on a 390 px phone: the shop owner finds a known customer and takes a set in by phone", async () => {
    const ctx = await newContext(browser, PHONE);
    const page = await ctx.newPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office");
    await page.getByRole("link", { name: "Take in a set" }).first().click();
    await page.waitForURL("**/bench/intake");
    expect(await pageWidth(page)).toBeLessThanOrEqual(PHONE.viewport.width + 1);
    await page.getByLabel("By phone", { exact: true }).first().check();
    await page.getByLabel("Find by name, e-mail or phone").fill("Holloway");
    const result = page.getByRole("list", { name: "Customers found" }).locator("label", { hasText: "Mira Holloway" });
    await expect.poll(() => result.count(), { timeout: 10_000 }).toBe(1);
    await result.click();
    await fillSet(page, "Phone-in 7");
    await snap(page, "intake-03-phone-filled");
    expect(await pageWidth(page)).toBeLessThanOrEqual(PHONE.viewport.width + 1);
    await page.getByRole("button", { name: "Open the job" }).click();
    await page.waitForURL(/\/bench\/jobs\/[0-9a-f-]{36}/, { timeout: 30_000 });
    await expect.poll(() => page.locator("header").filter({ hasText: "Phone-in 7" }).textContent()).toContain("Taken in by phone");
    await snap(page, "intake-04-phone-job");
    const jobId = /jobs\/([0-9a-f-]{36})/.exec(page.url())![1]!;
    const [row] = await sql<{ customer: string; received: boolean }>(
      `select u.email as customer, j.received_at is not null as received from job j join "user" u on u.id = j.customer_id where j.id = $1`,
      [jobId],
    );
    expect(row).toEqual({ customer: DEMO.customer.email, received: false });
    await ctx.close();
  });
});
