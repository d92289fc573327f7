import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { axeViolations, describeViolations } from "../support/axe";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";

// Nobody is stranded: an unknown address, another area's page and someone else's job each answer 404 in
// the shop's own look, with a way home and to sign in (usability practice: every error page offers a way on).

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("pages that are not there", () => {
  it("shows a visitor a styled 404 with ways home and to sign in", async () => {
    const context = await newContext(browser);
    const page = await context.newPage();
    const res = await page.goto("/no-such-page/at-all");
    expect(res?.status()).toBe(404);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("This page is not on our dial");
    expect(await page.getByRole("link", { name: "Home page" }).count()).toBeGreaterThan(0);
    expect(await page.getByRole("main").getByRole("link", { name: "Sign in" }).count()).toBe(1);
    expect(await page.getByRole("link", { name: "Check a certificate" }).count()).toBe(1);
    const violations = await axeViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    await snap(page, "not-found-visitor");
    await page.getByRole("main").getByRole("link", { name: "Home page" }).click();
    await page.waitForURL((u) => u.pathname === "/");
    await context.close();
  });

  it("sends a set owner who opens the bench back to their own sets", async () => {
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInPage(page, DEMO.customer.email, DEMO.customer.password);
    const res = await page.goto("/bench");
    expect(res?.status()).toBe(404);
    const back = page.getByRole("link", { name: "Back to my sets" });
    await expect.poll(() => back.count()).toBe(1);
    await back.click();
    await page.waitForURL((u) => u.pathname === "/portal");
    await context.close();
  });

  it("answers an unknown job inside the portal within the portal's own frame", async () => {
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInPage(page, DEMO.customer.email, DEMO.customer.password);
    const res = await page.goto("/portal/jobs/00000000-0000-4000-8000-000000000000");
    expect(res?.status()).toBe(404);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("We could not find that");
    // Still inside the portal: its section navigation is there.
    expect(await page.getByRole("navigation", { name: "My sets sections" }).count()).toBe(1);
    await snap(page, "not-found-portal");
    await context.close();
  });
});
