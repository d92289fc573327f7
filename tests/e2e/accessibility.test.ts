import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "../support/db";
import { axeViolations, describeViolations } from "../support/axe";
import { launchBrowser, newContext, signInPage } from "../support/browser";
import { AUDIENCES, followedAddress } from "../support/pages";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

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
        await check(page, await followedAddress(page, f));
      }
      if (a.certificatePage) {
        const [cert] = await sql<{ code: string }>("select code from certificate order by issued_at limit 1");
        await check(page, `/verify/${cert!.code}`);
      }
      await ctx.close();
    });
  }
});
