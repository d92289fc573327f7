import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "../support/db";
import { launchBrowser, newContext, PHONE, signInPage, snap } from "../support/browser";
import { DEMO } from "../support/accounts";
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

// A laptop screen: 1280 CSS pixels is a common desktop width (from memory of current laptop displays). The
// triage tab's band table sits in a two-thirds column there; it must stay inside its card (scrolling inside
// its own box if it must), not push the card past the column.
describe("the triage band table at 1280 px", () => {
  it("stays inside its card on the demo set with the most bands", async () => {
    const desk = await newContext(browser, { viewport: { width: 1280, height: 900 } });
    const page = await desk.newPage();
    await signInPage(page, DEMO.tech.email, DEMO.tech.password);
    const [job] = await sql<{ id: string }>(
      `select j.id from job j join radio_set s on s.id = j.set_id
        where jsonb_typeof(s.profile->'bands') = 'array'
        order by jsonb_array_length(s.profile->'bands') desc, j.created_at limit 1`,
    );
    await page.goto(`/bench/jobs/${job!.id}`);
    await page.getByRole("tab", { name: "Triage" }).click();
    const table = page.getByTestId("band-table");
    await table.waitFor();
    const box = await table.evaluate((t) => {
      const card = t.closest(".card")!.getBoundingClientRect();
      const scroller = t.parentElement!;
      return {
        tableRight: t.getBoundingClientRect().right,
        cardRight: card.right,
        scrollerRight: scroller.getBoundingClientRect().right,
        columnRight: t.closest(".card")!.parentElement!.getBoundingClientRect().right,
        pageWidth: document.documentElement.scrollWidth,
        scrolls: scroller.scrollWidth > scroller.clientWidth + 1,
      };
    });
    await snap(page, "triage-1280");
    await page.getByRole("tab", { name: "Estimate" }).click();
    await page.getByRole("table", { name: "Estimate lines" }).waitFor();
    await snap(page, "estimate-1280");
    await desk.close();
    // The same tabs on a phone, for the record.
    const phone = await newContext(browser, PHONE);
    const small = await phone.newPage();
    await signInPage(small, DEMO.tech.email, DEMO.tech.password);
    await small.goto(`/bench/jobs/${job!.id}`);
    await small.getByRole("tab", { name: "Triage" }).click();
    await small.getByTestId("band-table").waitFor();
    await snap(small, "triage-390");
    await small.getByRole("tab", { name: "Estimate" }).click();
    await small.getByRole("table", { name: "Estimate lines" }).waitFor();
    await snap(small, "estimate-390");
    await phone.close();
    expect(box.pageWidth).toBeLessThanOrEqual(1281);
    expect(box.cardRight).toBeLessThanOrEqual(box.columnRight + 1);
    expect(box.scrollerRight).toBeLessThanOrEqual(box.cardRight + 1);
    // Shown whole at this width: nothing of the table hides behind its scroll box.
    expect(box.scrolls).toBe(false);
    expect(box.tableRight).toBeLessThanOrEqual(box.cardRight + 1);
  });
});
