import { randomUUID } from "node:crypto";
import sharp from "sharp";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { launchBrowser, newContext, snap } from "../support/browser";
import { sql } from "../support/db";
import { firstLink, waitForMail } from "../support/mail";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

// Photos large enough that each upload's progress bar is on screen for a moment.
async function photo(color: string): Promise<Buffer> {
  const noise = await sharp({
    create: { width: 1600, height: 1200, channels: 3, background: "#000000", noise: { type: "gaussian", mean: 128, sigma: 60 } },
  })
    .png()
    .toBuffer();
  return sharp({ create: { width: 1600, height: 1200, channels: 3, background: color } })
    .composite([{ input: noise, blend: "overlay" }])
    .jpeg({ quality: 95 })
    .toBuffer();
}

async function text(page: Page, testId: string): Promise<string> {
  return (await page.getByTestId(testId).textContent())?.trim() ?? "";
}

describe("a set owner's journey", () => {
  it("signs up, requests a quote with three photos, approves the estimate, pays the deposit and gets the receipt", async () => {
    const email = `journey-${randomUUID().slice(0, 8)}@example.com`;
    const context = await newContext(browser);
    const page = await context.newPage();

    // 1. Sign up and confirm the address.
    await page.goto("/sign-up");
    await page.getByLabel("Your name").fill("Ada Journey");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill("crystal-set-1931");
    await page.getByRole("button", { name: "Create account" }).click();
    await expect.poll(() => page.getByText("Check your e-mail").count()).toBe(1);
    await page.goto(firstLink(await waitForMail(email, "Confirm your e-mail"), "verify-email"));
    await page.waitForURL(/\/portal/);
    await snap(page, "journey-01-signed-up");

    // 2. The quote request, with three photos.
    await page.getByRole("link", { name: "Request a quote" }).first().click();
    await page.waitForURL(/\/portal\/request/);
    await page.getByLabel("Maker").fill("Aurelian");
    await page.getByLabel("Model").fill("5T-48");
    await page.getByLabel("Year (if you know it)").fill("1948");
    await page.getByLabel(/Tube set without a mains transformer/).check();
    await page.getByLabel(/Medium wave/).check();
    await page.getByLabel("What does it do, or not do?").fill("It hums loudly, then goes quiet after a minute. The dial lamp works.");
    await page.getByLabel("Briefly, to see if it works").check();
    await page.locator("#photos").setInputFiles([
      { name: "front.jpg", mimeType: "image/jpeg", buffer: await photo("#9c3d1c") },
      { name: "back.jpg", mimeType: "image/jpeg", buffer: await photo("#5b3a29") },
      { name: "chassis.jpg", mimeType: "image/jpeg", buffer: await photo("#8a6a22") },
    ]);
    await expect.poll(() => page.locator("li[data-status]").count()).toBe(3);
    await snap(page, "journey-02-photos-uploading");
    await expect.poll(() => page.locator('li[data-status="done"]').count(), { timeout: 60_000 }).toBe(3);
    await snap(page, "journey-03-photos-uploaded");

    // Submitting without the cautions acknowledged is refused beside the box.
    await page.getByRole("button", { name: "Send my quote request" }).click();
    await expect.poll(() => page.getByText("Cautions: please read them and tick the box.").count()).toBe(1);
    await page.getByLabel(/I have read these cautions/).check();
    await snap(page, "journey-04-cautions");
    await page.getByRole("button", { name: "Send my quote request" }).click();
    await page.waitForURL(/\/portal\/jobs\/[0-9a-f-]{36}\?new=1/);
    const jobId = /\/portal\/jobs\/([0-9a-f-]{36})/.exec(page.url())![1]!;
    await expect.poll(() => page.getByText("Your request is with the shop").count()).toBe(1);
    await expect.poll(() => page.getByRole("img", { name: /Photo: / }).count()).toBe(3);
    // The thumbnails are served (re-encoded) to their owner.
    await expect
      .poll(() =>
        page
          .locator('img[alt^="Photo: "]')
          .evaluateAll((imgs) => imgs.every((i) => (i as HTMLImageElement).complete && (i as HTMLImageElement).naturalWidth > 0)),
      )
      .toBe(true);
    await snap(page, "journey-05-request-sent");
    await waitForMail(email, "We received your quote request");

    // 3. A technician triages, corrects the profile and sends the estimate through the bench API.
    const tech = await signedIn(DEMO.tech);
    expect((await tech.post(`/api/bench/jobs/${jobId}/triage`, {})).status).toBe(200);
    const profile = await tech.request(`/api/bench/jobs/${jobId}/profile`, {
      method: "PUT",
      json: {
        maker: "Aurelian",
        model: "5T-48",
        year: 1948,
        profile: {
          kind: "tube-acdc",
          bands: [{ kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455 }],
          electrolytics: 3,
          paperCapacitors: 9,
          tubes: 5,
          mainsVolts: 120,
          lineCordWorn: true,
        },
      },
    });
    expect(profile.status).toBe(200);
    const draft = (await (await tech.get(`/api/bench/jobs/${jobId}/estimate`)).json()) as { version: number; lines: unknown[] };
    expect(draft.lines.length).toBeGreaterThan(0);
    const saved = await tech.request(`/api/bench/jobs/${jobId}/estimate`, {
      method: "PUT",
      json: { version: draft.version, lines: draft.lines },
    });
    expect(saved.status).toBe(200);
    const { version } = (await saved.json()) as { version: number };
    expect((await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version })).status).toBe(200);
    await waitForMail(email, /estimate/i);

    // 4. The owner reads and approves the estimate.
    await page.goto(`/portal/jobs/${jobId}`);
    await expect.poll(() => page.getByRole("heading", { name: "Estimate", exact: true }).count()).toBe(1);
    await expect.poll(() => page.getByRole("heading", { name: "Safety" }).count()).toBe(1);
    await expect.poll(() => page.getByText(/^Why: /).count()).toBeGreaterThan(0);
    await expect.poll(() => page.getByRole("heading", { name: "What the warranty will cover" }).count()).toBe(1);
    // The certificate is issued when the set is returned (the completion step), so the estimate cannot speak
    // of "this certificate": it names the certificate to come.
    expect(await page.locator("main").innerText()).not.toMatch(/this certificate/i);
    expect(await page.locator("main").innerText()).toMatch(/certificate you receive with the set/);
    const deposit = await text(page, "estimate-deposit");
    expect(deposit).toMatch(/^\$\d+\.\d{2}$/);
    await snap(page, "journey-06-estimate");
    await page.getByRole("button", { name: /Approve this estimate/ }).click();
    await expect.poll(() => page.getByRole("button", { name: `Pay the deposit of ${deposit}` }).count()).toBe(1);
    await snap(page, "journey-07-approved");

    // 5. The deposit, on the payment stand-in's page.
    await page.getByRole("button", { name: `Pay the deposit of ${deposit}` }).click();
    await page.waitForURL(/\/checkout\/cs_/);
    await expect.poll(() => page.getByText(deposit.replace("$", "")).count()).toBeGreaterThan(0);
    await snap(page, "journey-08-checkout");
    await page.getByRole("button", { name: "Pay with test card (declined)" }).click();
    await expect.poll(() => page.getByText("Your card was declined").count()).toBe(1);
    await snap(page, "journey-09-declined");
    await page.getByRole("button", { name: "Pay with test card (succeeds)" }).click();
    await page.waitForURL(/\/portal\/jobs\/[0-9a-f-]{36}\/payment\?session_id=cs_/);
    await snap(page, "journey-10-confirming");
    await expect.poll(() => page.getByText("Deposit received — thank you").count(), { timeout: 30_000 }).toBe(1);
    await snap(page, "journey-11-confirmed");

    // 6. The job shows the deposit as paid, and the receipt is in the mailbox.
    await page.getByRole("link", { name: "Back to my job" }).click();
    await expect.poll(() => page.getByTestId("payment-deposit").textContent()).toMatch(/Paid/);
    expect(await text(page, "job-state")).toContain("Deposit received");
    await snap(page, "journey-12-deposit-paid");
    const receipt = await waitForMail(email, "Deposit received");
    expect(receipt.text).toContain(deposit);
    await page.goto(`/mailbox?to=${encodeURIComponent(email)}`);
    await expect.poll(() => page.getByText(/Deposit received for KL-/).count()).toBeGreaterThan(0);
    await snap(page, "journey-13-mailbox-receipt");

    const [row] = await sql<{ state: string; paid: string }>(
      "select j.state, (select count(*) from payment p where p.job_id = j.id and p.status = 'paid') as paid from job j where j.id = $1",
      [jobId],
    );
    expect(row).toEqual({ state: "deposit_paid", paid: "1" });
    await context.close();
  });
});
