// Bench weeks set in the office drive the owner's expected bench days and the office's backlog. What is checked
// here comes from the queue's own rule stated to owners (first come, first served, so a deposit paid just now
// puts the set behind every job already waiting or on the bench: common practice for a repair bench) and from
// the calendar, not from the forecast's arithmetic (that is tested against hand-worked days in the unit tests).
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { dayInZone } from "@/lib/engine/dates";
import { DEMO } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { sql } from "../support/db";
import { seedJobWithEstimate } from "../fixtures/jobs";

let browser: Browser;
let savedWeeks: { user_id: string; minutes: unknown; days_off: unknown }[] = [];

beforeAll(async () => {
  browser = await launchBrowser();
  savedWeeks = await sql("select user_id, minutes, days_off from bench_week");
});
afterAll(async () => {
  // The other tests see the bench weeks as seeded.
  await sql("delete from bench_week");
  for (const w of savedWeeks)
    await sql("insert into bench_week (user_id, minutes, days_off) values ($1, $2, $3)", [
      w.user_id,
      JSON.stringify(w.minutes),
      JSON.stringify(w.days_off),
    ]);
  await browser?.close();
});

describe("turnaround forecast", () => {
  it("takes a technician's bench week in the office, with field-named errors, and tells the owner the set's place and days", async () => {
    const [tech] = await sql<{ id: string; name: string }>(`select id, name from "user" where email = $1`, [DEMO.tech.email]);
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office/staff");
    await page.locator("summary", { hasText: tech!.name }).click();
    const form = page.getByRole("form", { name: `Bench week of ${tech!.name}` });
    await form.getByLabel("Monday").fill("25");
    await form.getByLabel("Days off").fill("2026-12-24\n2026-02-30");
    await form.getByRole("button", { name: /Save bench week/ }).click();
    await expect.poll(() => form.getByText("Monday: enter the bench hours as a number from 0 to 16.").count()).toBe(1);
    // 30 February does not exist (calendar).
    await expect.poll(() => form.getByText(/Days off: "2026-02-30" is not a date/).count()).toBe(1);
    for (const [day, hours] of [
      ["Monday", "5"],
      ["Tuesday", "5"],
      ["Wednesday", "5"],
      ["Thursday", "5"],
      ["Friday", "4.5"],
      ["Saturday", "0"],
      ["Sunday", "0"],
    ])
      await form.getByLabel(day).fill(hours);
    await form.getByLabel("Days off").fill("2026-12-24, 2026-12-25");
    await form.getByRole("button", { name: /Save bench week/ }).click();
    await expect.poll(() => form.getByText(`Bench week saved for ${tech!.name}.`).count()).toBe(1);
    await snap(page, "office-bench-week");
    const [row] = await sql<{ minutes: number[]; days_off: string[] }>("select minutes, days_off from bench_week where user_id = $1", [
      tech!.id,
    ]);
    expect(row).toEqual({ minutes: [300, 300, 300, 300, 270, 0, 0], days_off: ["2026-12-24", "2026-12-25"] });
    const [audit] = await sql<{ n: number }>(
      "select count(*)::int as n from audit_event where action = 'staff.bench-week' and entity_id = $1",
      [tech!.id],
    );
    expect(audit!.n).toBeGreaterThan(0);

    // The office reads the backlog in weeks.
    await page.goto("/office");
    await expect.poll(() => page.getByText(/\d+(\.\d)? weeks/).count()).toBeGreaterThan(0);
    await ctx.close();

    // A deposit paid just now: the set goes behind every job already waiting for the bench or on it.
    const job = await seedJobWithEstimate({ email: DEMO.customer.email, state: "deposit_paid" });
    await sql("update estimate_revision set status = 'approved', decided_at = now() where id = $1", [job.revisionId]);
    await sql(
      "insert into job_state_history (job_id, from_state, to_state) values ($1, 'estimate_sent', 'approved'), ($1, 'approved', 'deposit_paid')",
      [job.jobId],
    );
    const [ahead] = await sql<{ n: number }>(
      "select count(*)::int as n from job where state in ('deposit_paid', 'on_bench', 'bench_revision') and id <> $1",
      [job.jobId],
    );
    const owner = await newContext(browser);
    const p = await owner.newPage();
    await signInPage(p, DEMO.customer.email, DEMO.customer.password);
    await p.goto(`/portal/jobs/${job.jobId}`);
    const forecast = p.getByTestId("queue-forecast");
    await expect.poll(() => forecast.innerText()).toContain(`Place in the bench queue: ${ahead!.n + 1}`);
    const text = await forecast.innerText();
    expect(text).toMatch(/Expected on the bench (on|between) \d{1,2} [A-Z][a-z]+ \d{4}/);
    // Never a day before today (calendar, in the shop's days).
    const first = /(?:on|between) (\d{1,2} [A-Z][a-z]+ \d{4})/.exec(text)![1]!;
    const [{ time_zone }] = (await sql<{ time_zone: string }>("select time_zone from shop_settings where id = 'shop'")) as [
      { time_zone: string },
    ];
    expect(Date.parse(`${first} UTC`)).toBeGreaterThanOrEqual(Date.parse(`${dayInZone(new Date(), time_zone)}T00:00:00Z`));
    await snap(p, "portal-queue-forecast");

    // With no bench hours anywhere, the owner is told so rather than given a date.
    await sql("update bench_week set minutes = '[0,0,0,0,0,0,0]'");
    await sql(
      `insert into bench_week (user_id, minutes) select id, '[0,0,0,0,0,0,0]' from "user" where role in ('technician', 'owner') on conflict (user_id) do update set minutes = excluded.minutes`,
    );
    await p.reload();
    await expect.poll(() => p.getByTestId("queue-forecast").innerText()).toContain("has not set its bench hours");
    await owner.close();
  });
});
