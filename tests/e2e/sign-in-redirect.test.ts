import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { newCustomer } from "../support/accounts";
import { launchBrowser, newContext } from "../support/browser";
import { testEnv } from "../support/env";

// After signing in, the page follows ?next=. Chromium reads "/\host", "/<tab>/host" and "//host" as another
// host (WHATWG URL Standard: "\" is a path separator for special schemes, tab and newline are removed), so
// each of these must end on our own origin (common practice: OWASP "Unvalidated Redirects and Forwards").
let browser: Browser;
let account: { email: string; password: string };
beforeAll(async () => {
  browser = await launchBrowser();
  account = await newCustomer("redirect");
});
afterAll(async () => {
  await browser?.close();
});

async function signInWithNext(rawQuery: string): Promise<URL> {
  const context = await newContext(browser);
  const page = await context.newPage();
  try {
    await page.goto(`/sign-in?next=${rawQuery}`);
    await page.getByLabel("E-mail").fill(account.email);
    await page.getByLabel("Password").fill(account.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL((u) => !u.pathname.startsWith("/sign-in") && !u.pathname.startsWith("/after-sign-in"), { timeout: 20_000 });
    return new URL(page.url());
  } finally {
    await context.close();
  }
}

describe("the return address after signing in", () => {
  const origin = new URL(testEnv.appUrl).origin;

  it("follows a path on our own site", async () => {
    const url = await signInWithNext(encodeURIComponent("/portal"));
    expect(url.origin).toBe(origin);
    expect(url.pathname).toBe("/portal");
  });

  for (const [label, raw] of [
    ["an encoded backslash", "/%5Cother.example/path"],
    ["a raw backslash", "/\\other.example/path"],
    ["a tab", "/%09/other.example/path"],
    ["a protocol-relative address", "%2F%2Fother.example%2Fpath"],
    ["a full address", encodeURIComponent("https://other.example/path")],
    ["a double-encoded backslash", "/%255Cother.example/path"],
  ] as const) {
    it(`never leaves the site for ${label}`, async () => {
      const url = await signInWithNext(raw);
      expect(url.origin, url.href).toBe(origin);
    });
  }
});
