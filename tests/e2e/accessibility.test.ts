import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { axeViolations, describeViolations } from "../support/axe";
import { launchBrowser, newContext, signInPage } from "../support/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

// Every page in its main state, per audience. Pages with ids are reached by following the first link of a list.
const AUDIENCES: { who: string; login?: { email: string; password: string }; pages: string[]; follow?: { from: string; link: RegExp }[] }[] = [
  { who: "anonymous", pages: ["/", "/sign-in", "/sign-up", "/reset-password", "/verify", "/mailbox"] },
  { who: "set owner", login: DEMO.customer, pages: ["/portal"] },
  { who: "technician", login: DEMO.tech, pages: ["/bench"] },
  { who: "shop owner", login: DEMO.owner, pages: ["/office", "/office/staff"] },
];

async function check(page: Page, path: string) {
  await page.goto(path);
  await page.waitForLoadState("load");
  const violations = await axeViolations(page);
  expect(violations, `${path}\n${describeViolations(violations)}`).toEqual([]);
}

describe("accessibility (axe-core, WCAG 2.2 AA tags)", () => {
  for (const a of AUDIENCES) {
    it(`has no violations on the ${a.who} pages`, async () => {
      const ctx = await newContext(browser);
      const page = await ctx.newPage();
      if (a.login) await signInPage(page, a.login.email, a.login.password);
      for (const path of a.pages) await check(page, path);
      for (const f of a.follow ?? []) {
        await page.goto(f.from);
        const href = await page.getByRole("link", { name: f.link }).first().getAttribute("href");
        if (href) await check(page, href);
      }
      await ctx.close();
    });
  }
});
