import type { Browser } from "playwright-core";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap, visibleRuleCodes } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { createCertificate, stopQueue } from "../integration/certificates-fixtures";

async function photo(): Promise<Buffer> {
  return sharp({ create: { width: 800, height: 600, channels: 3, background: "#5b3a29" } })
    .jpeg({ quality: 90 })
    .toBuffer();
}

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await stopQueue();
  await closeTestPool();
});

describe("a certificate from issue to claim", () => {
  it("a buyer checks it, the owner claims, the bench accepts, the office revokes", async () => {
    const c = await createCertificate({ serial: "AU-52-4471" });

    // A buyer with only the code.
    const buyer = await (await newContext(browser)).newPage();
    await buyer.goto("/verify");
    await buyer.getByLabel("Certificate code").fill(c.code.toLowerCase());
    await buyer.getByRole("button", { name: "Check" }).click();
    await buyer.waitForURL(new RegExp(`/verify/${c.code}$`));
    await expect.poll(() => buyer.getByText(/Valid$/).count()).toBe(1);
    expect(await buyer.getByRole("table").getByRole("rowheader", { name: "Broadcast" }).count()).toBe(1);
    expect(await buyer.getByText("AU••••71").count()).toBe(1);
    await snap(buyer, "warranty-01-verify-valid");
    await buyer.context().close();

    // The owner opens a claim from the certificate.
    const ctx = await newContext(browser);
    const owner = await ctx.newPage();
    await signInPage(owner, DEMO.customer.email, DEMO.customer.password);
    await owner.goto("/portal/claims");
    await expect.poll(() => owner.getByText(c.code, { exact: true }).count()).toBe(1);
    await snap(owner, "warranty-02-portal-claims");
    await owner.getByRole("link", { name: `Open a claim on certificate ${c.code}` }).click();
    await owner.waitForURL(/\/portal\/claims\/new/);
    await owner.getByRole("button", { name: "Open the claim" }).click();
    await expect.poll(() => owner.getByText("What the set does: choose one of the options.").count()).toBe(1);
    expect(await owner.getByText(/at least 10 characters/).count()).toBe(1);
    await snap(owner, "warranty-03-claim-form-errors");
    await owner.getByLabel("What does the set do?").selectOption("hum");
    await owner.getByLabel("Describe the fault").fill("A hum comes up after the set warms up and does not go away.");
    await owner.locator("#photos").setInputFiles([{ name: "filter-section.jpg", mimeType: "image/jpeg", buffer: await photo() }]);
    await expect.poll(() => owner.locator('li[data-status="done"]').count(), { timeout: 60_000 }).toBe(1);
    await owner.getByRole("button", { name: "Open the claim" }).click();
    await owner.waitForURL(/\/portal\/claims\/[0-9a-f-]{36}$/);
    await expect.poll(() => owner.getByText("Waiting for the shop").count()).toBe(1);
    await snap(owner, "warranty-04-claim-opened");
    await ctx.close();

    // The bench decides with the advice.
    const techCtx = await newContext(browser);
    const tech = await techCtx.newPage();
    await signInPage(tech, DEMO.tech.email, DEMO.tech.password);
    await tech.goto("/bench/claims");
    await snap(tech, "warranty-05-bench-claims");
    const [claim] = await sql<{ id: string }>("select id from claim where certificate_id = $1", [c.certificateId]);
    await tech.goto(`/bench/claims/${claim!.id}`);
    await expect.poll(() => tech.getByText(/Likely covered/).count()).toBeGreaterThan(0);
    // The advice names the work and the symptom in words; codes stay behind the staff disclosure.
    expect(await tech.locator('section[aria-labelledby="advice-h"]').innerText()).toMatch(/Hum or buzz: could come from/);
    expect(await visibleRuleCodes(tech)).toEqual([]);
    await expect.poll(() => tech.getByRole("img", { name: "filter-section.jpg" }).count()).toBe(1);
    expect(
      await tech.getByRole("img", { name: "filter-section.jpg" }).evaluate((img: HTMLImageElement) => img.naturalWidth),
    ).toBeGreaterThan(0);
    await tech.getByLabel(/Accept: open a warranty job/).check();
    await tech.getByLabel("Message to the owner").fill("The filter capacitor we fitted has failed; we will replace it at no charge.");
    await snap(tech, "warranty-06-bench-claim-advice");
    await tech.getByRole("button", { name: "Record the decision" }).click();
    await expect.poll(() => tech.getByText("Warranty job opened").count(), { timeout: 15_000 }).toBe(1);
    const [job] = await sql<{ is_warranty: boolean }>("select is_warranty from job where claim_id = $1", [claim!.id]);
    expect(job!.is_warranty).toBe(true);
    await snap(tech, "warranty-07-bench-claim-accepted");
    await techCtx.close();

    // The shop owner revokes with a reason; the public page says so.
    const officeCtx = await newContext(browser);
    const office = await officeCtx.newPage();
    await signInPage(office, DEMO.owner.email, DEMO.owner.password);
    await office.goto("/office/certificates");
    const row = office.getByRole("row").filter({ hasText: c.code });
    await row.getByRole("button", { name: "Revoke…" }).click();
    await row.getByLabel("Reason for revoking").fill("Chassis swapped before return");
    await row.getByRole("button", { name: "Revoke the certificate" }).click();
    // Revoking waits for a confirmation that says what will happen.
    await expect.poll(() => row.getByRole("alertdialog").textContent()).toMatch(/cannot be undone.+verification page.+e-mail the owner/);
    expect((await sql<{ r: Date | null }>("select revoked_at as r from certificate where code = $1", [c.code]))[0]!.r).toBeNull();
    await row.getByRole("button", { name: "Yes, revoke the certificate" }).click();
    await expect.poll(() => office.getByRole("row").filter({ hasText: c.code }).getByText("Revoked").count(), { timeout: 15_000 }).toBe(1);
    await snap(office, "warranty-08-office-certificates");
    await office.goto(`/verify/${c.code}`);
    await expect.poll(() => office.getByText("Chassis swapped before return", { exact: false }).count()).toBe(1);
    await snap(office, "warranty-09-verify-revoked");
    await officeCtx.close();
  });
});
