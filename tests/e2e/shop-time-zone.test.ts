import type { Browser, Locator, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { formatDateTime } from "@/lib/engine/dates";
import { DEMO, signedIn } from "../support/accounts";
import { launchBrowser, signInPage, snap } from "../support/browser";
import { sql } from "../support/db";
import { testEnv } from "../support/env";
import { nextTestIp } from "../support/ip";
import type { TestClient } from "../support/http";

// Europe/London is GMT (UTC+0) in winter and BST (UTC+1) in summer; Asia/Tokyo is UTC+9 all year (IANA tz
// database, from memory). The browser is put in Tokyo: if any component used the browser's zone, its text
// would differ from the server's (a hydration mismatch React reports) and from the shop's London time.
const SHOP_ZONE = "Europe/London";

let browser: Browser;
let api: TestClient;
let original: { values: { identity: Record<string, unknown> } & Record<string, unknown> };

async function tokyoPage(): Promise<{ page: Page; problems: string[] }> {
  const ctx = await browser.newContext({
    baseURL: testEnv.appUrl,
    viewport: { width: 1280, height: 900 },
    timezoneId: "Asia/Tokyo",
    extraHTTPHeaders: { "x-forwarded-for": nextTestIp() },
  });
  const page = await ctx.newPage();
  const problems: string[] = [];
  // React reports a server/browser text mismatch as a recoverable error (minified #418 / #425 in production).
  page.on("console", (m) => {
    if (m.type() === "error" && /hydrat|#418|#423|#425/i.test(m.text())) problems.push(m.text());
  });
  page.on("pageerror", (e) => problems.push(e.message));
  return { page, problems };
}

async function fill(field: Locator, value: string) {
  await expect
    .poll(async () => {
      await field.fill(value);
      return field.inputValue();
    })
    .toBe(value);
}

beforeAll(async () => {
  browser = await launchBrowser();
  api = await signedIn(DEMO.owner);
  original = (await (await api.get("/api/office/settings")).json()) as typeof original;
});
afterAll(async () => {
  const now = (await (await api.get("/api/office/settings")).json()) as { version: number };
  await api.request("/api/office/settings", { method: "PUT", json: { ...original.values, version: now.version } });
  await browser?.close();
});

describe("the shop's time zone", () => {
  it("is set in the office, refused when unknown, and every area then shows the shop's time, not the browser's", async () => {
    const { page, problems } = await tokyoPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office/settings");
    await expect.poll(() => page.getByLabel("Labour rate").inputValue()).toBe("90.00");
    const zone = page.getByLabel("Time zone");
    expect(await zone.inputValue()).toBe(original.values.identity.timeZone);

    await fill(zone, "Mars/Olympus_Mons");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect.poll(() => page.getByText(/^Time zone: not a known time zone/).count()).toBeGreaterThan(0);
    await zone.scrollIntoViewIfNeeded();
    await snap(page, "time-zone-01-refused");

    await fill(zone, "europe/london");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect.poll(() => page.getByText(/^Saved at/).count()).toBe(1);
    const [row] = await sql<{ time_zone: string; updated_at: Date }>("select time_zone, updated_at from shop_settings where id = 'shop'");
    expect(row!.time_zone).toBe(SHOP_ZONE);
    // The confirmation gives the save's time in London, though the browser is in Tokyo.
    const savedAt = formatDateTime(row!.updated_at, { timeZone: SHOP_ZONE, style: "compact" });
    expect(await page.getByText(/^Saved at/).textContent()).toContain(savedAt);
    await snap(page, "time-zone-02-saved");

    // Staff: the audit log and the bench queue, times in London.
    await page.goto("/office/audit?action=settings.update");
    await expect.poll(() => page.getByText(savedAt).count()).toBeGreaterThan(0);
    await snap(page, "time-zone-03-audit");

    const tech = await tokyoPage();
    await signInPage(tech.page, DEMO.tech.email, DEMO.tech.password);
    await tech.page.goto("/bench");
    await expect.poll(() => tech.page.getByRole("columnheader", { name: /Last change/ }).count()).toBe(1);
    const changes = (await sql<{ updated_at: Date }>("select updated_at from job")).map((j) =>
      formatDateTime(j.updated_at, { timeZone: SHOP_ZONE, style: "compact" }),
    );
    await expect
      .poll(async () => {
        const html = await tech.page.content();
        return changes.some((c) => html.includes(c)) && !/\d UTC</.test(html);
      })
      .toBe(true);
    await snap(tech.page, "time-zone-04-bench-queue");

    // A set owner: the job page's history gives times with the zone named (GMT or BST in London).
    const owner = await tokyoPage();
    await signInPage(owner.page, DEMO.customer.email, DEMO.customer.password);
    const [job] = await sql<{ id: string; at: Date }>(
      `select j.id, max(h.at) as at from job j join job_state_history h on h.job_id = j.id
       join "user" u on u.id = j.customer_id where u.email = $1 group by j.id order by max(h.at) desc limit 1`,
      [DEMO.customer.email],
    );
    await owner.page.goto(`/portal/jobs/${job!.id}`);
    const stamp = formatDateTime(job!.at, { timeZone: SHOP_ZONE, showZone: true });
    expect(stamp).toMatch(/ (GMT|BST)$/);
    await expect.poll(() => owner.page.getByText(stamp).count()).toBeGreaterThan(0);
    await snap(owner.page, "time-zone-05-portal-job");

    expect([...problems, ...tech.problems, ...owner.problems]).toEqual([]);
  });
});
