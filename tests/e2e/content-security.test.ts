// Pages under the nonce-based Content Security Policy still hydrate: the browser reports no policy
// violation (the securitypolicyviolation event of W3C CSP Level 3) on the pages of each audience, and
// React takes over the page (a control that works only with JavaScript responds).
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { launchBrowser, newContext, signInPage } from "../support/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function watchedPage(): Promise<{ page: Page; violations: string[] }> {
  const context = await newContext(browser);
  const violations: string[] = [];
  await context.exposeFunction("reportViolation", (v: string) => violations.push(v));
  await context.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (e) => {
      (window as unknown as { reportViolation(v: string): void }).reportViolation(`${e.violatedDirective} ${e.blockedURI}`);
    });
  });
  const page = await context.newPage();
  page.on("console", (m) => {
    if (m.type() === "error" && /Content Security Policy/i.test(m.text())) violations.push(m.text());
  });
  return { page, violations };
}

describe("pages under the Content Security Policy", () => {
  it("hydrate on public, portal and office pages with no policy violation", async () => {
    const { page, violations } = await watchedPage();
    await page.goto("/");
    await page.goto("/sign-in");
    // The sign-in form is handled by script (a plain form would reload /sign-in): hydration worked.
    await signInPage(page, DEMO.customer.email, DEMO.customer.password);
    await expect.poll(() => page.getByRole("heading", { name: "My jobs" }).count()).toBe(1);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((u) => u.pathname === "/");

    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office");
    await page.waitForLoadState("networkidle");
    expect(violations).toEqual([]);
  });
});
