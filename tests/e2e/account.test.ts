import { randomUUID } from "node:crypto";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { sql } from "../support/db";
import { firstLink, waitForMail } from "../support/mail";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("an owner of a set signs up, verifies, signs in and resets a password", () => {
  it("works end to end through the mail stand-in", async () => {
    const email = `newcomer-${randomUUID().slice(0, 8)}@example.com`;
    const context = await newContext(browser);
    const page = await context.newPage();

    await page.goto("/sign-up");
    await page.getByLabel("Your name").fill("Ada Newcomer");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill("crystal-set-1931");
    await page.getByRole("button", { name: "Create account" }).click();
    await expect.poll(() => page.getByText("Check your e-mail").count()).toBe(1);
    await snap(page, "account-01-signed-up");

    const verify = await waitForMail(email, "Confirm your e-mail");
    await page.goto(firstLink(verify, "verify-email"));
    await page.waitForURL(/\/portal/);
    await expect.poll(() => page.getByRole("heading", { name: "My jobs" }).count()).toBe(1);
    await snap(page, "account-02-portal");

    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((u) => u.pathname === "/");
    await page.goto("/portal");
    await page.waitForURL(/\/sign-in/);

    await page.goto("/reset-password");
    await page.getByLabel("E-mail of your account").fill(email);
    await page.getByRole("button", { name: "Send me a link" }).click();
    await expect.poll(() => page.getByText("Check your e-mail").count()).toBe(1);
    const reset = await waitForMail(email, "Choose a new password");
    await page.goto(firstLink(reset, "reset-password"));
    await page.getByLabel("New password").fill("valve-glow-1948");
    await page.getByLabel("Type it again").fill("valve-glow-1948");
    await page.getByRole("button", { name: "Set new password" }).click();
    await expect.poll(() => page.getByText("Password changed").count()).toBe(1);

    await signInPage(page, email, "valve-glow-1948");
    expect(new URL(page.url()).pathname).toBe("/portal");
    await snap(page, "account-03-signed-in-after-reset");
    await context.close();
  });
});

describe("the owner manages staff", () => {
  it("invites a technician, who sets a password and is cut off at once when deactivated", async () => {
    const email = `apprentice-${randomUUID().slice(0, 8)}@kestrel-lane.example`;
    const ownerCtx = await newContext(browser);
    const owner = await ownerCtx.newPage();
    await signInPage(owner, DEMO.owner.email, DEMO.owner.password);
    await owner.goto("/office/staff");
    await owner.getByLabel("Name").fill("Felix Apprentice");
    await owner.getByLabel("E-mail").fill(email);
    await owner.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => owner.getByText(`Invitation sent to ${email}.`).count()).toBe(1);

    const invite = await waitForMail(email, "invited");
    const techCtx = await newContext(browser);
    const tech = await techCtx.newPage();
    await tech.goto(firstLink(invite, "/welcome?token="));
    await tech.getByLabel("New password").fill("solder-sucker-77");
    await tech.getByLabel("Type it again").fill("solder-sucker-77");
    await tech.getByRole("button", { name: "Set my password" }).click();
    await expect.poll(() => tech.getByText("Password set").count()).toBe(1);
    await signInPage(tech, email, "solder-sucker-77");
    expect(new URL(tech.url()).pathname).toBe("/bench");

    await owner.reload();
    await owner.getByRole("button", { name: "Deactivate Felix Apprentice" }).click();
    // Deactivating asks first, naming what happens and who is told; nothing changes until the owner confirms.
    await expect
      .poll(() => owner.getByRole("alertdialog").textContent())
      .toMatch(new RegExp(`signed out everywhere at once.+We e-mail ${email.replace(/[.+]/g, "\\$&")}`));
    expect((await sql<{ banned: boolean }>(`select banned from "user" where email = $1`, [email]))[0]!.banned).toBe(false);
    await owner.getByRole("button", { name: "Yes, deactivate Felix Apprentice" }).click();
    await expect.poll(() => owner.getByRole("button", { name: "Reactivate Felix Apprentice" }).count()).toBe(1);
    await snap(owner, "staff-01-deactivated");

    await tech.goto("/bench");
    await tech.waitForURL(/\/sign-in/);
    const notice = await waitForMail(email, "Your workshop access was turned off");
    expect(notice.html).toContain("signed out everywhere");
    await ownerCtx.close();
    await techCtx.close();
  });

  it("refuses to make a set owner's account staff unless the owner confirms what it holds", async () => {
    const ownerCtx = await newContext(browser);
    const owner = await ownerCtx.newPage();
    await signInPage(owner, DEMO.owner.email, DEMO.owner.password);
    await owner.goto("/office/staff");

    // A customer with jobs: refused with a clear message; the account is untouched.
    await owner.getByLabel("Name").fill("Mira Holloway");
    await owner.getByLabel("E-mail").fill(DEMO.customer.email);
    await owner.getByRole("button", { name: "Send invitation" }).click();
    await expect
      .poll(() => owner.getByText(/belongs to a set owner's account \(\d+ jobs?, \d+ certificates?.+\d+ claims?\)/).count())
      .toBeGreaterThan(0);
    const [mira] = await sql<{ role: string }>(`select role from "user" where email = $1`, [DEMO.customer.email]);
    expect(mira!.role).toBe("customer");
    await owner.getByRole("button", { name: "Cancel" }).click();

    // Converting on purpose: the confirmation names what the account holds, then the invitation goes out.
    const { email } = await newCustomer("convert");
    await owner.getByLabel("Name").fill("Converted Customer");
    await owner.getByLabel("E-mail").fill(email);
    await owner.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => owner.getByRole("alertdialog").textContent()).toMatch(/It holds 0 jobs, 0 certificates and 0 claims/);
    await snap(owner, "staff-02-convert-confirmation");
    await owner.getByRole("button", { name: "Yes, convert the account holding 0 jobs, 0 certificates and 0 claims" }).click();
    await expect.poll(() => owner.getByText(`Invitation sent to ${email}.`).count()).toBe(1);
    const [converted] = await sql<{ role: string }>(`select role from "user" where email = $1`, [email]);
    expect(converted!.role).toBe("technician");
    const invite = await waitForMail(email, "invited");
    expect(firstLink(invite, "/welcome?token=")).toContain("/welcome?token=");
    await ownerCtx.close();
  });
});
