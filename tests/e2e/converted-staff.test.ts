import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { sql } from "../support/db";
import { TestClient } from "../support/http";
import { firstLink, waitForMail } from "../support/mail";
import { createCertificate, stopQueue } from "../integration/certificates-fixtures";

// Staff and customer accounts are kept apart, but an owner's account converted on purpose keeps what it holds:
// its own job and certificate stay in its portal, beside the bench (common practice: converting an account
// must not make its records unreachable to their owner).

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await stopQueue();
});

describe("a set owner's account converted to staff", () => {
  it("still lists its job and certificate in the portal, and the header offers both areas", async () => {
    // Demo-like: a set owner with a restored Corvane returned to them and its warranty certificate.
    const { email, password: oldPassword } = await newCustomer("corvane-owner");
    const [holder] = await sql<{ id: string }>(`select id from "user" where email = $1`, [email]);
    const cert = await createCertificate({ customerId: holder!.id, maker: "Corvane", model: "Seven-Transistor" });

    const ownerCtx = await newContext(browser);
    const owner = await ownerCtx.newPage();
    await signInPage(owner, DEMO.owner.email, DEMO.owner.password);
    await owner.goto("/office/staff");
    await owner.getByLabel("Name").fill("Converted Owner");
    await owner.getByLabel("E-mail").fill(email);
    await owner.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => owner.getByRole("alertdialog").textContent()).toMatch(/It holds 1 job, 1 certificate and 0 claims/);
    await expect.poll(() => owner.getByRole("alertdialog").textContent()).toMatch(/still see and answer their own jobs/);
    await owner.getByRole("button", { name: "Yes, convert the account holding 1 job, 1 certificate and 0 claims" }).click();
    await expect.poll(() => owner.getByText(`Invitation sent to ${email}.`).count()).toBe(1);
    await ownerCtx.close();

    // Until the invitation is accepted, the portal password opens nothing: staff access starts with the
    // invitation (common practice: a change of role is confirmed by the person, not inherited from an old secret).
    const early = await new TestClient().post("/api/auth/sign-in/email", { email, password: oldPassword });
    expect(early.status).toBeGreaterThanOrEqual(400);
    expect(await sql(`select 1 from session where user_id = $1`, [holder!.id])).toHaveLength(0);

    const invite = await waitForMail(email, "invited");
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await page.goto(firstLink(invite, "/welcome?token="));
    await page.getByLabel("New password").fill("output-transformer-61");
    await page.getByLabel("Type it again").fill("output-transformer-61");
    await page.getByRole("button", { name: "Set my password" }).click();
    await expect.poll(() => page.getByText("Password set").count()).toBe(1);
    await signInPage(page, email, "output-transformer-61");
    expect(new URL(page.url()).pathname).toBe("/bench");

    // Both areas in the header; the portal lists the account's own job.
    const main = page.getByRole("navigation", { name: "Main" });
    expect(await main.getByRole("link", { name: "Bench" }).count()).toBe(1);
    await main.getByRole("link", { name: "My sets" }).click();
    await page.waitForURL((u) => u.pathname === "/portal");
    await expect.poll(() => page.getByRole("link", { name: /Corvane Seven-Transistor/ }).count()).toBe(1);
    await snap(page, "converted-staff-01-portal");
    await page.getByRole("link", { name: /Corvane Seven-Transistor/ }).click();
    await page.waitForURL(new RegExp(`/portal/jobs/${cert.jobId}`));
    await expect.poll(() => page.getByText(cert.code).count()).toBeGreaterThan(0);
    await snap(page, "converted-staff-02-certificate");

    // Its warranty claims page lists the certificate too.
    await page.goto("/portal/claims");
    await expect.poll(() => page.getByText(cert.code).count()).toBeGreaterThan(0);
    await ctx.close();
  });
});
