import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "../support/db";
import { launchBrowser, newContext, PHONE, signInPage, snap } from "../support/browser";
import { AUDIENCES, followedAddress } from "../support/pages";

// Every page fits a phone: at 390 CSS pixels (a common phone width, from memory of current handsets) the
// page itself never scrolls sideways; wide tables scroll inside their own box (WCAG 2.2 SC 1.4.10 Reflow
// asks for no two-dimensional scrolling at 320 px, except for content such as data tables that needs it).

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function overflow(page: Page, path: string): Promise<string | null> {
  await page.goto(path);
  await page.waitForLoadState("load");
  const wide = await page.evaluate((screenWidth) => {
    const doc = document.documentElement;
    // Not innerWidth: a mobile browser widens its layout viewport to fit content that sticks out.
    if (doc.scrollWidth <= screenWidth + 1) return null;
    // Name the outermost elements that stick out, so the failure says where to look.
    const out: string[] = [];
    for (const el of Array.from(document.body.querySelectorAll<HTMLElement>("*"))) {
      const r = el.getBoundingClientRect();
      if (r.right <= screenWidth + 1 || r.width === 0) continue;
      const parent = el.parentElement;
      if (parent && parent !== document.body && parent.getBoundingClientRect().right > screenWidth + 1) continue;
      out.push(`${el.tagName.toLowerCase()}.${String(el.className).slice(0, 60)} right=${Math.round(r.right)}`);
    }
    return `page is ${doc.scrollWidth}px wide: ${out.slice(0, 5).join("; ")}`;
  }, PHONE.viewport.width);
  return wide ? `${path}: ${wide}` : null;
}

describe("every page fits a 390 px phone", () => {
  for (const a of AUDIENCES) {
    it(`keeps the ${a.who} pages within the screen`, async () => {
      const phone = await newContext(browser, PHONE);
      const page = await phone.newPage();
      if (a.login) await signInPage(page, a.login.email, a.login.password);
      const problems: string[] = [];
      const paths = [...a.pages];
      for (const f of a.follow ?? []) {
        paths.push(await followedAddress(page, f));
      }
      if (a.certificatePage) {
        const [cert] = await sql<{ code: string }>("select code from certificate order by issued_at limit 1");
        paths.push(`/verify/${cert!.code}`);
      }
      for (const path of paths) {
        const p = await overflow(page, path);
        if (p) problems.push(p);
      }
      await snap(page, `phone-${a.who.replace(/\s+/g, "-")}-last`);
      await phone.close();
      expect(problems).toEqual([]);
    });
  }
});
