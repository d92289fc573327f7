import { randomUUID } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { launchBrowser, newContext, PHONE, signInPage, snap, visibleRuleCodes } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { createJob } from "../integration/bench-fixtures";

// The office parts page and the estimate builder's catalogue search, on a desktop and on a 390 px phone.

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

/** The page scrolls no wider than the screen (tables scroll inside their own box). */
const pageWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

describe("the office parts page", () => {
  for (const [label, device] of [
    ["desktop", undefined],
    ["390", PHONE],
  ] as const) {
    it(`adds, edits and retires a part, with field-named errors (${label})`, async () => {
      const context = await newContext(browser, device);
      const page = await context.newPage();
      await signInPage(page, DEMO.owner.email, DEMO.owner.password);
      await page.goto("/office/parts");
      await expect.poll(() => page.locator("tr[data-part]").count()).toBeGreaterThanOrEqual(11);
      expect(await visibleRuleCodes(page)).toEqual([]);

      // Nothing filled in: each field says what it wants, by name.
      const add = page.getByRole("form", { name: "Add a part" });
      await add.getByLabel("Cost (USD)").fill("4.5.0");
      await add.getByLabel("In stock").fill("many");
      await add.getByRole("button", { name: "Add the part" }).click();
      await expect
        .poll(() => add.locator(".field-error").allInnerTexts())
        .toEqual(
          expect.arrayContaining([
            expect.stringMatching(/^Name: /),
            expect.stringMatching(/^Cost: enter an amount/),
            expect.stringMatching(/^In stock: enter a whole number/),
          ]),
        );
      await snap(page, `parts-01-errors-${label}`);

      const name = `Pilot lamp 6.3 V 0.15 A ${randomUUID().slice(0, 4)}`;
      await add.getByLabel("Name").fill(name);
      await add.getByLabel("Supplier reference").fill("PL-47");
      await add.getByLabel("Cost (USD)").fill("4.50");
      await add.getByLabel("Markup (%)").fill("35");
      await add.getByLabel("In stock").fill("6");
      await add.getByRole("button", { name: "Add the part" }).click();
      await expect
        .poll(() => page.getByRole("status").allInnerTexts())
        .toEqual(expect.arrayContaining([expect.stringContaining(`${name} added to the catalogue.`)]));

      // Search by the supplier reference finds it with its price: 4.50 at 35 % = 6.08 (worked by hand, half up).
      await page.getByLabel("Search").fill(name.slice(-4));
      const row = page.locator("tr[data-part]", { hasText: name });
      await expect.poll(() => page.locator("tr[data-part]").count()).toBe(1);
      expect(await row.innerText()).toMatch(/\$6\.08/);
      expect(await pageWidth(page)).toBeLessThanOrEqual(device ? 390 : 1280);
      await snap(page, `parts-02-found-${label}`);

      await row.getByRole("button", { name: `Edit ${name}` }).click();
      const edit = page.getByRole("form", { name: `Edit ${name}` });
      await edit.getByLabel("Cost (USD)").fill("5.00");
      await edit.getByRole("button", { name: "Save the part" }).click();
      // 5.00 × 1.35 = 6.75.
      await expect.poll(() => row.innerText()).toMatch(/\$6\.75/);

      await row.getByRole("button", { name: `Retire ${name}` }).click();
      await expect.poll(() => page.locator("tr[data-part]").count()).toBe(0);
      await page.getByLabel("Show").selectOption("retired");
      await expect.poll(() => row.getAttribute("data-retired")).toBe("yes");
      await snap(page, `parts-03-retired-${label}`);
      const [audits] = await sql<{ n: number }>(
        "select count(*)::int as n from audit_event a join part p on p.id::text = a.entity_id where p.name = $1",
        [name],
      );
      expect(audits!.n).toBe(3); // add, edit, retire
      await context.close();
    });
  }
});

describe("adding a searched part in the estimate builder", () => {
  for (const [label, device] of [
    ["desktop", undefined],
    ["390", PHONE],
  ] as const) {
    it(`finds a part by typing, adds it with the keyboard, and warns past the stock count (${label})`, async () => {
      const name = `Dial drum spring ${randomUUID().slice(0, 4)}`;
      await sql("insert into part (name, supplier_ref, cost_minor, markup_bp, stock) values ($1, 'DS-9', 450, 3500, 1)", [name]);
      const { jobId } = await createJob({ state: "in_triage", technicianEmail: DEMO.tech.email });
      const context = await newContext(browser, device);
      const page = await context.newPage();
      await signInPage(page, DEMO.tech.email, DEMO.tech.password);
      await page.goto(`/bench/jobs/${jobId}`);
      await page.getByRole("tab", { name: "Estimate" }).click();
      const search = page.getByRole("combobox", { name: "Add a part from the catalogue" });
      await search.fill(name);
      const option = page.getByRole("option", { name: new RegExp(name) });
      await expect.poll(() => option.count()).toBe(1);
      expect(await option.innerText()).toMatch(/\$6\.08 each.*1 in stock/s);
      await snap(page, `parts-04-builder-search-${label}`);
      // Keyboard only: the arrow picks the answer, Enter adds it.
      await search.press("ArrowDown");
      await search.press("ArrowUp");
      await expect.poll(() => search.getAttribute("aria-activedescendant")).toBeTruthy();
      await search.press("Enter");
      const line = page.locator('tr[data-line^="part.c-"]');
      await expect.poll(() => line.count()).toBe(1);
      expect(await line.locator('input[id$="-num"]').inputValue()).toBe("4.50");
      await line.locator('input[id$="-qty"]').fill("3");
      await expect.poll(() => line.innerText()).toMatch(/Only 1 in stock and the estimate asks for 3/);
      // 3 × 6.08 = 18.24 on the line.
      await expect.poll(() => line.innerText()).toMatch(/\$18\.24/);
      await snap(page, `parts-05-builder-added-${label}`);
      await page.getByRole("button", { name: "Save draft" }).click();
      await expect.poll(() => page.getByText(/^Saved \(version \d+\)\.$/).count()).toBe(1);
      const [draft] = await sql<{ lines: { partId?: string; unitCost: string }[] }>(
        "select draft->'lines' as lines from estimate where job_id = $1",
        [jobId],
      );
      const [part] = await sql<{ id: string }>("select id from part where name = $1", [name]);
      expect(draft!.lines.find((l) => l.partId === part!.id)).toMatchObject({ unitCost: "4.50" });
      await context.close();
    });
  }
});
