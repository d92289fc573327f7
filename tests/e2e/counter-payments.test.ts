import { readFileSync } from "node:fs";
import { PDFParse } from "pdf-parse";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { sql } from "../support/db";
import { seedJobWithEstimate } from "../fixtures/jobs";

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function readyJob(): Promise<{ jobId: string; label: string }> {
  const job = await seedJobWithEstimate({ email: DEMO.customer2.email, state: "balance_due" });
  await sql("update estimate_revision set status = 'approved', decided_at = now() where id = $1", [job.revisionId]);
  return { jobId: job.jobId, label: `KL-${String(job.number).padStart(4, "0")}` };
}

describe("the office takes cash at the counter", () => {
  for (const device of [
    { name: "desktop", viewport: { width: 1280, height: 900 } },
    { name: "phone", viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true },
  ]) {
    it(`records a cash payment and downloads its receipt (${device.name})`, async () => {
      const { jobId, label } = await readyJob();
      const { name: _name, ...screen } = device;
      const ctx = await newContext(browser, screen);
      const page = await ctx.newPage();
      await signInPage(page, DEMO.owner.email, DEMO.owner.password);
      await page.goto("/office/payments");
      await expect.poll(() => page.getByRole("heading", { name: "Record cash or a cheque" }).count()).toBe(1);
      // The seeded estimate's total, 312.40, is owed in full.
      await expect
        .poll(async () => {
          await page.getByLabel("Job").fill(label);
          return page.getByLabel("Job").inputValue();
        })
        .toBe(label);
      await page.getByLabel(/^Amount/).fill("312.40");
      await page.getByRole("radio", { name: "Cash" }).check();
      await page.getByRole("button", { name: "Record payment" }).click();
      const link = page.getByRole("link", { name: /Download receipt RCT-\d{4}-\d{4,}/ });
      await expect.poll(() => link.count(), { timeout: 20_000 }).toBe(1);
      await snap(page, `counter-payment-${device.name}`);
      // Nothing sticks out sideways on a phone.
      expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth + 1)).toBe(true);

      const [download] = await Promise.all([page.waitForEvent("download"), link.click()]);
      const number = /RCT-\d{4}-\d{4,}/.exec((await link.textContent()) ?? "")![0];
      expect(download.suggestedFilename()).toBe(`${number}.pdf`);
      const parser = new PDFParse({ data: new Uint8Array(readFileSync((await download.path())!)) });
      const text = (await parser.getText()).text.replace(/\s+/g, " ");
      await parser.destroy();
      expect(text).toContain(number);
      expect(text).toContain("$312.40");
      const [row] = await sql<{ state: string }>("select state::text as state from job where id = $1", [jobId]);
      expect(row!.state).toBe("paid_in_full");
      await ctx.close();
    });
  }
});
