import { evaluate } from "mathjs";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { axeViolations, describeViolations } from "../support/axe";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { closeTestPool } from "../support/db";
import { AURELIAN_PROFILE, createJob } from "../integration/bench-fixtures";

// The textbook single-tuned response |H| = 1/sqrt(1 + (2Q·Δf/f0)²), −3 dB bandwidth f0/Q (from memory of any
// radio-engineering text), evaluated by mathjs at f0 = 455 kHz, Q = 50: 9.1 kHz wide.
const SWEEP_TEXT = Array.from({ length: 21 }, (_, i) => {
  const df = -20 + 2 * i;
  return `${df} ${(evaluate("20 * log10(1 / sqrt(1 + (2 * 50 * df / 455)^2))", { df }) as number).toFixed(2)}`;
}).join("\n");

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

describe("performance readings on the bench sheet", () => {
  it("opts in, records and judges readings, and plots the IF passband", async () => {
    const { jobId } = await createJob({ state: "on_bench", profile: { ...AURELIAN_PROFILE }, technicianEmail: DEMO.tech.email });
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInPage(page, DEMO.tech.email, DEMO.tech.password);
    await page.goto(`/bench/jobs/${jobId}`);
    await page.getByRole("tab", { name: "Bench sheet" }).click();
    await expect.poll(() => page.getByRole("heading", { name: "Performance" }).count()).toBe(1);
    expect(await page.locator("[data-performance]").count()).toBe(0);

    await page.getByLabel("Take performance readings on this job").click();
    await expect.poll(() => page.locator("[data-performance]").count()).toBeGreaterThan(5);

    // Signal-to-noise without a service figure: recorded, never passed.
    const snr = page.locator('tr[data-performance="perf.snr"]');
    await snr.getByRole("textbox", { name: "Signal-to-noise at 1 mV input", exact: true }).fill("32");
    await snr.getByRole("button", { name: /Save/ }).click();
    await expect.poll(() => snr.getByText("Saved").count()).toBe(1);
    expect(await snr.getAttribute("data-verdict")).toBe("recorded");

    // Sensitivity typed in dBµV: 20 dBµV is 10 µV (definition), against a 15 µV service figure: better, so a pass.
    const mid = page.locator('tr[data-performance="perf.band.0.sens.mid"]');
    await mid.getByRole("combobox").selectOption("dBµV");
    await mid.getByRole("textbox").first().fill("20");
    expect(await mid.innerText()).toMatch(/= 10 µV/);
    await mid.getByLabel(/Service figure for/).fill("15");
    expect(await mid.getAttribute("data-verdict")).toBe("pass");
    await mid.getByRole("button", { name: /Save/ }).click();
    await expect.poll(() => page.locator('tr[data-performance="perf.band.0.sens.mid"]').getByText("Saved").count()).toBe(1);
    expect(await page.locator('tr[data-performance="perf.band.0.sens.mid"]').innerText()).toMatch(
      /at most 15 µV \(the set's service figure\)/,
    );

    // The IF passband, point by point: the figures, the table and the plot.
    await page.getByLabel(/One point a line/).fill(SWEEP_TEXT);
    await page.getByRole("button", { name: "Save the points" }).click();
    await expect.poll(() => page.getByTestId("pb-455-response-figures").count()).toBe(1);
    // Linear interpolation between points 2 kHz apart lands within 0.1 kHz of f0/Q.
    const width = /−3 dB bandwidth ([\d.]+) kHz/.exec(await page.getByTestId("pb-455-response-figures").innerText());
    expect(Number(width![1])).toBeCloseTo(9.1, 1);
    await expect.poll(() => page.locator("[data-sweep-point]").count()).toBe(21);
    expect(await page.getByRole("img", { name: /455 kHz: −3 dB bandwidth/ }).count()).toBe(1);
    expect(await page.getByRole("table", { name: "The points as read" }).locator("tbody tr").count()).toBe(21);

    const violations = (await axeViolations(page)).filter((v) => v.impact === "serious" || v.impact === "critical");
    expect(violations, describeViolations(violations)).toEqual([]);

    await page.mouse.move(0, 0);
    await page.getByTestId("performance-panel").scrollIntoViewIfNeeded();
    await snap(page, "performance-01-sheet-1280");
    await page.setViewportSize({ width: 390, height: 844 });
    await page.getByTestId("performance-panel").scrollIntoViewIfNeeded();
    await snap(page, "performance-02-sheet-390");
    await context.close();
  });
});
