import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { sql } from "../support/db";
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
const AUDIENCES: {
  who: string;
  login?: { email: string; password: string };
  pages: string[];
  follow?: { from: string; link: RegExp }[];
  certificatePage?: boolean;
}[] = [
  { who: "anonymous", pages: ["/", "/sign-in", "/sign-up", "/reset-password", "/verify", "/mailbox"], certificatePage: true },
  {
    who: "set owner",
    login: DEMO.customer,
    pages: ["/portal", "/portal/request", "/portal/claims"],
    follow: [
      { from: "/portal", link: /Aurelian/ },
      { from: "/portal", link: /Haldane/ },
      { from: "/portal/claims", link: /KL-|Aurelian|claim/i },
    ],
  },
  {
    who: "technician",
    login: DEMO.tech,
    pages: ["/bench", "/bench/calculator", "/bench/claims"],
    follow: [
      { from: "/bench", link: /KL-0008/ },
      { from: "/bench", link: /KL-0002/ },
      { from: "/bench/claims", link: /KL-|Aurelian|claim/i },
    ],
  },
  {
    who: "shop owner",
    login: DEMO.owner,
    pages: ["/office", "/office/staff", "/office/settings", "/office/payments", "/office/certificates", "/office/audit", "/office/reports"],
    follow: [{ from: "/office/payments", link: /KL-/ }],
  },
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
        const link = page.getByRole("link", { name: f.link }).first();
        await link.waitFor({ timeout: 15_000 });
        const href = await link.getAttribute("href");
        expect(href, `a link matching ${f.link} on ${f.from}`).toBeTruthy();
        await check(page, href!);
      }
      if (a.certificatePage) {
        const [cert] = await sql<{ code: string }>("select code from certificate order by issued_at limit 1");
        await check(page, `/verify/${cert!.code}`);
      }
      await ctx.close();
    });
  }
});
