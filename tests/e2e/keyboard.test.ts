import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "../support/db";
import { launchBrowser, newContext, snap } from "../support/browser";
import { focused, signInByKeyboard, tabTo } from "../support/keyboard";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("keyboard alone", () => {
  it("lets a set owner open a job and approve the estimate", async () => {
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInByKeyboard(page, "brennan.estate@example.org", "demo-owner-2026");
    await page.goto("/portal");
    await tabTo(page, (f) => f.tag === "A" && f.text.includes("Aurelian Model 5T-48"), "the job link");
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/portal\/jobs\//);
    await page.getByRole("button", { name: /Approve this estimate/ }).waitFor();
    await tabTo(page, (f) => f.tag === "BUTTON" && f.text.startsWith("Approve this estimate"), "the approve button");
    await page.keyboard.press("Enter");
    await expect
      .poll(async () => (await sql<{ state: string }>("select state from job where idempotency_key = 'demo-estimate'"))[0]!.state, {
        timeout: 15_000,
      })
      .toBe("approved");
    await snap(page, "keyboard-01-estimate-approved");
    await ctx.close();
  });

  it("lets a technician reach the bench sheet and record readings, Enter moving to the next", async () => {
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInByKeyboard(page, "tomas@kestrel-lane.example", "bench-tech-2026");
    const [job] = await sql<{ id: string; number: number }>("select id, number from job where idempotency_key = 'demo-bench'");
    await page.goto("/bench");
    const label = `KL-${String(job!.number).padStart(4, "0")}`;
    // The queue's first page fills with the jobs other tests create: search for the demo job first.
    await page.getByLabel("Search", { exact: true }).fill(label);
    await page.getByRole("link", { name: label }).waitFor();
    await tabTo(page, (f) => f.tag === "A" && f.text === label, "the job in the queue");
    await page.keyboard.press("Enter");
    await page.waitForURL(new RegExp(`/bench/jobs/${job!.id}`));
    await page.getByRole("tab", { name: "Bench sheet" }).waitFor();
    await tabTo(page, (f) => f.role === "tab" && f.text.includes("Bench sheet"), "the bench sheet tab");
    await page.keyboard.press("Enter");
    await page.locator("input[id^='rd-']").first().waitFor();
    await tabTo(page, (f) => f.tag === "INPUT" && f.id.startsWith("rd-"), "the first reading");
    const first = (await focused(page)).id;
    await page.keyboard.type("455");
    await page.keyboard.press("Enter");
    await expect.poll(async () => (await focused(page)).id).not.toBe(first);
    expect((await focused(page)).id.startsWith("rd-")).toBe(true);
    await expect
      .poll(async () => (await sql<{ n: number }>("select count(*)::int as n from reading where job_id = $1", [job!.id]))[0]!.n, {
        timeout: 15_000,
      })
      .toBeGreaterThan(0);
    await snap(page, "keyboard-02-bench-sheet");
    await ctx.close();
  });
});
