import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { testEnv } from "./env";
import { nextTestIp } from "./ip";

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: testEnv.chromium,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

/** A phone held upright: 390 CSS pixels wide, touch, mobile viewport rules. */
export const PHONE = { viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true } as const;

export async function newContext(
  browser: Browser,
  device: { viewport: { width: number; height: number }; isMobile?: boolean; hasTouch?: boolean } = {
    viewport: { width: 1280, height: 900 },
  },
): Promise<BrowserContext> {
  return browser.newContext({
    baseURL: testEnv.appUrl,
    ...device,
    extraHTTPHeaders: { "x-forwarded-for": nextTestIp() },
  });
}

export async function snap(page: Page, name: string): Promise<string> {
  const dir = join(testEnv.artifacts, "screenshots");
  mkdirSync(dir, { recursive: true });
  const path = join(dir, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}

export async function signInPage(page: Page, email: string, password: string): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((u) => !u.pathname.startsWith("/sign-in") && !u.pathname.startsWith("/after-sign-in"), { timeout: 20_000 });
}

/**
 * Text on the page that looks like an internal rule or part code ("inspect.intake", "safety.selenium"), outside
 * a <details> disclosure (where staff may look codes up). E-mail addresses and "e.g." are not codes.
 */
export async function visibleRuleCodes(page: Page, root = "main"): Promise<string[]> {
  return page
    .locator(root)
    .first()
    .evaluate((el) => {
      const found: string[] = [];
      const walker = document.createTreeWalker(el, NodeFilter.SHOW_TEXT);
      for (let n = walker.nextNode(); n; n = walker.nextNode()) {
        const parent = n.parentElement;
        if (!parent || parent.closest("details, script, style, template")) continue;
        const text = (n.textContent ?? "").replace(/\S+@\S+/g, " ").replace(/\be\.g\./g, " ");
        for (const m of text.matchAll(/\b[a-z]+\.[a-z-]+\b/g)) found.push(`${m[0]} in "${text.trim().slice(0, 80)}"`);
      }
      return found;
    });
}
