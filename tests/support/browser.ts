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
