// A technician hears of an owner's message: the bell in the header counts it, the list shows it unread, and
// its link leads to the job, which marks it read; at a desktop width and on a phone held upright (390 CSS
// pixels, the common small-phone width: common practice), with nothing wider than the screen.
import { randomUUID } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { launchBrowser, newContext, PHONE, signInPage, snap } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { createJob } from "../integration/bench-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

async function unreadInDb(email: string): Promise<number> {
  const [row] = await sql<{ n: number }>(
    `select count(*)::int as n from notification n join "user" u on u.id = n.recipient_id where u.email = $1 and n.read_at is null`,
    [email],
  );
  return row!.n;
}

async function overflow(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
}

const WIDTHS = [
  { name: "desktop", device: undefined },
  { name: "phone", device: PHONE },
] as const;

describe("the technician's bell and list", () => {
  for (const { name, device } of WIDTHS) {
    it(`shows the count, opens the list and follows the link to the job (${name})`, async () => {
      const customer = await newCustomer(`bell-${name}`);
      const job = await createJob({ customerEmail: customer.email, state: "on_bench", technicianEmail: DEMO.tech2.email });
      const words = `Found the original knob in a drawer, shall I post it? (${randomUUID().slice(0, 4)})`;
      const posted = await customer.client.post(`/api/portal/jobs/${job.jobId}/messages`, { body: words, idempotencyKey: randomUUID() });
      expect(posted.status).toBe(201);
      const unread = await unreadInDb(DEMO.tech2.email);
      expect(unread).toBeGreaterThan(0);

      const ctx = await newContext(browser, device);
      const page = await ctx.newPage();
      await signInPage(page, DEMO.tech2.email, DEMO.tech2.password);
      await page.goto("/bench");
      const bell = page.getByTestId("notification-bell");
      await expect.poll(() => bell.getAttribute("aria-label")).toBe(`Notifications, ${unread} unread`);
      expect(await page.getByTestId("notification-count").textContent()).toBe(unread > 99 ? "99+" : String(unread));
      expect(await overflow(page)).toBeLessThanOrEqual(1);
      await snap(page, `notifications-01-bench-bell-${name}`);

      await bell.click();
      await page.waitForURL("**/staff/notifications");
      const item = page.getByTestId("notification-list").locator("li", { hasText: words });
      await expect.poll(() => item.count()).toBe(1);
      expect(await item.getByText(/^\W*Unread$/).count()).toBe(1);
      expect(await overflow(page)).toBeLessThanOrEqual(1);
      await snap(page, `notifications-02-list-${name}`);

      await item.getByRole("link").click();
      await page.waitForURL(`**/bench/jobs/${job.jobId}`);
      await expect.poll(() => unreadInDb(DEMO.tech2.email)).toBe(unread - 1);
      await expect
        .poll(() => bell.getAttribute("aria-label"))
        .toBe(unread - 1 === 0 ? "Notifications, none unread" : `Notifications, ${unread - 1} unread`);
      await snap(page, `notifications-03-job-after-link-${name}`);

      // The profile, reachable from the header, where the choices are made.
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "My profile" }).click();
      await page.waitForURL("**/staff/profile");
      const emailBox = page.getByRole("group", { name: "Estimate approved or declined" }).getByLabel("By e-mail");
      expect(await emailBox.isChecked()).toBe(false);
      await emailBox.check();
      await page.getByRole("button", { name: "Save choices" }).click();
      await expect.poll(() => page.getByText("Your notification choices are saved.").count()).toBe(1);
      const [stored] = await sql<{ email: boolean }>(
        `select p.email from notification_preference p join "user" u on u.id = p.user_id where u.email = $1 and p.kind = 'estimate_decided'`,
        [DEMO.tech2.email],
      );
      expect(stored?.email).toBe(true);
      expect(await overflow(page)).toBeLessThanOrEqual(1);
      await snap(page, `notifications-04-profile-${name}`);
      await sql(`delete from notification_preference where user_id = (select id from "user" where email = $1)`, [DEMO.tech2.email]);
      await ctx.close();
    });
  }
});
