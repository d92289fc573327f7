import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { launchBrowser, newContext, PHONE, signInPage, snap } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { AURELIAN_PROFILE, createJob } from "../integration/bench-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

async function openSheet(page: Page, jobId: string) {
  await page.goto(`/bench/jobs/${jobId}`);
  await page.getByRole("tab", { name: "Bench sheet" }).click();
  await expect.poll(() => page.locator('tr[data-reading="band.0.edge.low"]').count()).toBe(1);
}

async function demoInstrument(model: string): Promise<string> {
  const [row] = await sql<{ id: string }>("select id from instrument where model = $1", [model]);
  return row!.id;
}

describe("choosing instruments on the bench sheet", () => {
  it("offers the instruments of the reading's kind, remembers the technician's choice and flags an overdue one", async () => {
    // A technician of their own, so the choice remembered is this test's alone: Priya, on two fresh jobs.
    await sql("delete from instrument_choice where user_id = 'demo-tech-priya'");
    const first = await createJob({ state: "on_bench", profile: { ...AURELIAN_PROFILE }, technicianEmail: DEMO.tech2.email });
    const second = await createJob({ state: "on_bench", profile: { ...AURELIAN_PROFILE }, technicianEmail: DEMO.tech2.email });
    const sg40 = await demoInstrument("SG-40");
    const fc7 = await demoInstrument("FC-7");
    const retired = await demoInstrument("SG-12");

    const context = await newContext(browser);
    const page = await context.newPage();
    await signInPage(page, DEMO.tech2.email, DEMO.tech2.password);
    await openSheet(page, first.jobId);
    // A set just in, nothing ticked: the sheet records as received.
    expect(await page.getByLabel("As received", { exact: true }).isChecked()).toBe(true);

    const low = page.locator('tr[data-reading="band.0.edge.low"]');
    const lowSelect = low.getByLabel("Instrument for", { exact: false });
    // A band edge is read off a signal generator or a counter; the retired generator and the meter are not offered.
    const offered = await lowSelect.locator("option").evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value));
    expect(offered).toContain(sg40);
    expect(offered).toContain(fc7);
    expect(offered).not.toContain(retired);
    expect(offered).not.toContain(await demoInstrument("KM-3"));
    expect(await page.locator('tr[data-reading="leakage.plug-a"] select option').allInnerTexts()).toEqual(
      expect.arrayContaining([expect.stringMatching(/LT-2, Tillwater Electric/)]),
    );

    await lowSelect.selectOption(sg40);
    await low.locator("input").fill("548 kHz");
    const saved = page.waitForResponse(
      (r) => r.url().endsWith(`/api/bench/jobs/${first.jobId}/readings`) && r.request().method() === "POST",
    );
    await low.locator("input").press("Enter");
    expect((await saved).status()).toBe(200);
    await expect
      .poll(async () => (await sql("select phase, instrument_id, instrument_overdue from reading where job_id = $1", [first.jobId]))[0])
      .toEqual({ phase: "as_received", instrument_id: sg40, instrument_overdue: false });
    // The next row of the same kind proposes it at once.
    expect(await page.locator('tr[data-reading="band.0.edge.high"] select').inputValue()).toBe(sg40);
    await snap(page, "instruments-01-bench-sheet-chosen");

    // The frequency counter is past its calibration due date: chosen, it warns; saved, the reading is flagged.
    const high = page.locator('tr[data-reading="band.0.edge.high"]');
    await high.locator("select").selectOption(fc7);
    await expect.poll(() => high.locator('[data-calibration="overdue"]').innerText()).toMatch(/Calibration was due .* flagged/);
    await high.locator("input").fill("1604 kHz");
    await high.locator("input").press("Enter");
    await expect.poll(() => high.locator('[data-flag="calibration-overdue"]').count()).toBe(1);
    const [flagged] = await sql<{ instrument_overdue: boolean }>(
      "select instrument_overdue from reading where job_id = $1 and key = 'band.0.edge.high'",
      [first.jobId],
    );
    expect(flagged!.instrument_overdue).toBe(true);
    await snap(page, "instruments-02-bench-sheet-overdue");

    // Another job, another day: the last signal generator is proposed again (kept on the server per technician).
    await openSheet(page, second.jobId);
    expect(await page.locator('tr[data-reading="band.0.edge.low"] select').inputValue()).toBe(sg40);
    // Switching to as returned shows the other phase's figure beside the row on the first job.
    await openSheet(page, first.jobId);
    await page.getByLabel("As returned", { exact: true }).check();
    await expect
      .poll(() => page.locator('tr[data-reading="band.0.edge.low"] [data-other-phase]').innerText())
      .toMatch(/As received: 548 kHz/);
    await context.close();

    // The same sheet on a phone.
    const phone = await newContext(browser, PHONE);
    const p = await phone.newPage();
    await signInPage(p, DEMO.tech2.email, DEMO.tech2.password);
    await openSheet(p, first.jobId);
    expect(await p.locator('tr[data-reading="band.0.edge.low"] select').inputValue()).toBe(sg40);
    await snap(p, "instruments-03-bench-sheet-390");
    await phone.close();
  });
});

describe("the office's instrument register", () => {
  it("adds an instrument and retires it, at desktop width and on a phone", async () => {
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInPage(page, DEMO.owner.email, DEMO.owner.password);
    await page.goto("/office/instruments");
    // The demo register: one overdue counter, shown in words.
    const fc = page.locator("tr[data-instrument]").filter({ hasText: "FC-7" });
    await expect.poll(() => fc.locator('[data-due="overdue"]').innerText()).toMatch(/overdue/);
    const serial = `PAI-E2E-${Date.now() % 100000}`;
    await page.getByLabel("Kind").selectOption("frequency_counter");
    await page.getByLabel("Maker").fill("Port Alder Instruments");
    await page.getByLabel("Model").fill("FC-9");
    await page.getByLabel("Serial").fill(serial);
    await page.getByLabel("Last calibration").fill("2026-09-01");
    await page.getByLabel("Calibration due").fill("2026-08-01");
    await page.getByRole("button", { name: "Add instrument" }).click();
    await expect.poll(() => page.getByText("Calibration due: the due date cannot be before the last calibration.").count()).toBe(1);
    await page.getByLabel("Calibration due").fill("2027-09-01");
    await page.getByRole("button", { name: "Add instrument" }).click();
    const row = page.locator("tr[data-instrument]").filter({ hasText: serial });
    await expect.poll(() => row.count()).toBe(1);
    await snap(page, "instruments-04-office-register");
    await row.getByRole("button", { name: /^Retire/ }).click();
    await expect.poll(() => row.getAttribute("data-retired")).toBe("yes");
    const [stored] = await sql<{ retired: boolean }>("select retired_at is not null as retired from instrument where serial = $1", [
      serial,
    ]);
    expect(stored!.retired).toBe(true);
    await context.close();

    const phone = await newContext(browser, PHONE);
    const p = await phone.newPage();
    await signInPage(p, DEMO.owner.email, DEMO.owner.password);
    await p.goto("/office/instruments");
    await expect.poll(() => p.locator("tr[data-instrument]").count()).toBeGreaterThan(3);
    await snap(p, "instruments-05-office-register-390");
    await phone.close();
  });
});
