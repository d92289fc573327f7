import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { parseAlignmentRequest, runAlignmentTool } from "@/lib/engine/requests/alignment-request";
import { formatNumber } from "@/lib/engine/verdicts";
import { DEMO } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap, visibleRuleCodes } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { approveAndPayDeposit, AURELIAN_PROFILE, createJob } from "../integration/bench-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

const jobNo = (n: number) => `KL-${String(n).padStart(4, "0")}`;

async function openTab(page: Page, name: string) {
  await page.getByRole("tab", { name }).click();
  await expect.poll(() => page.getByRole("tab", { name, selected: true }).count()).toBe(1);
}

async function stateBadge(page: Page): Promise<string> {
  return (await page.locator("main header").first().innerText()).replace(/\s+/g, " ");
}

describe("a technician takes an AC/DC set from request to balance due", () => {
  it("triages, estimates from the checklist, records readings with live verdicts and completes only once leakage passes", async () => {
    // An owner's request as submitted: the profile undercounts the electrolytics and misses the worn cord.
    const { jobId, number } = await createJob({ profile: { ...AURELIAN_PROFILE, electrolytics: 1, lineCordWorn: false } });
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInPage(page, DEMO.tech.email, DEMO.tech.password);

    // Queue: find the job by its number.
    await page.goto("/bench");
    await page.getByLabel("Search", { exact: true }).fill(jobNo(number));
    await expect.poll(() => page.locator("tbody tr[data-job]").count()).toBe(1);
    await snap(page, "bench-01-queue-search");
    await page.getByRole("link", { name: jobNo(number) }).click();
    await page.waitForURL(new RegExp(`/bench/jobs/${jobId}`));

    // Triage: pick it up, correct the profile.
    await page.getByRole("button", { name: "Pick up for triage" }).click();
    await expect.poll(() => stateBadge(page)).toContain("In triage");
    // Out-of-range counts are refused in words that name the field and the range (the profile allows 0 to 120
    // paper capacitors), never the validator's own phrasing or a wrong reason.
    const paper = page.getByLabel("Paper capacitors");
    const paperBefore = await paper.inputValue();
    for (const bad of ["99999", "-1"]) {
      await paper.fill(bad);
      await page.getByRole("button", { name: "Save profile" }).click();
      await expect.poll(() => page.getByText("Paper capacitors: enter a whole number from 0 to 120.").count()).toBe(1);
      expect(await page.getByText(/expected|received|>0|Enter a whole number\.$/).count()).toBe(0);
    }
    await snap(page, "bench-02a-triage-paper-capacitors-refused");
    await paper.fill(paperBefore);
    await page.getByLabel("Electrolytic capacitors").fill("3");
    await page.getByLabel("Line cord worn").check();
    await page.getByRole("button", { name: "Save profile" }).click();
    await expect.poll(() => page.getByText("Profile saved.").count()).toBe(1);
    await snap(page, "bench-02-triage");
    const [set] = await sql<{ profile: { electrolytics: number; lineCordWorn: boolean } }>(
      "select s.profile from radio_set s join job j on j.set_id = s.id where j.id = $1",
      [jobId],
    );
    expect(set!.profile).toMatchObject({ electrolytics: 3, lineCordWorn: true });

    // Estimate: the lines come from the checklist with their reasons; edits reprice live.
    await openTab(page, "Estimate");
    await expect.poll(() => page.locator('tr[data-line="safety.line-cord"]').count()).toBe(1);
    await expect.poll(() => page.locator('tr[data-line="safety.y-capacitor"]').innerText()).toMatch(/Y-class/);
    expect(await page.locator('tr[data-line="recap.electrolytic"] input[id$="-qty"]').inputValue()).toBe("3");
    const totalBefore = await page.locator('[data-total="Total"]').innerText();
    await page.locator('tr[data-line="inspect.intake"] input[id$="-num"]').fill("50");
    await expect.poll(() => page.locator('[data-total="Total"]').innerText()).not.toBe(totalBefore);
    // A part from the shop's catalogue, found by typing (a checklist part keeps its code on the line).
    const search = page.getByRole("combobox", { name: "Add a part from the catalogue" });
    await search.fill("Dial cord and");
    // The list answers the typed words (after the search's short pause), not an earlier list that also held the part.
    const answers = page.getByRole("listbox", { name: "Catalogue parts" }).getByRole("option");
    await expect
      .poll(async () => {
        const shown = await answers.allInnerTexts();
        return shown.length === 1 && /Dial cord and spring/.test(shown[0]!);
      })
      .toBe(true);
    await search.press("ArrowDown");
    await search.press("ArrowUp");
    await expect.poll(() => search.getAttribute("aria-activedescendant")).toBeTruthy();
    await search.press("Enter");
    await expect.poll(() => page.locator('tr[data-line="part.cord.dial"]').count()).toBe(1);
    await page.getByRole("button", { name: /Remove line \d+: Burn-in/ }).click();
    await expect.poll(() => page.locator('tr[data-line="test.burn-in"]').count()).toBe(0);
    const shownTotal = await page.locator('[data-total="Total"]').innerText();
    // The lines keep their codes as data; nothing on the builder shows one as text.
    expect(await visibleRuleCodes(page, 'form[aria-labelledby="estimate-heading"]')).toEqual([]);
    await snap(page, "bench-03-estimate-builder");
    await page.getByRole("button", { name: "Send estimate to the owner" }).click();
    await expect.poll(() => page.getByText("Revision 1 sent to the owner.").count()).toBe(1);
    await expect.poll(() => stateBadge(page)).toContain("Estimate out");
    const [rev] = await sql<{ total_minor: number; currency: string }>(
      "select total_minor, currency from estimate_revision where job_id = $1 and revision = 1",
      [jobId],
    );
    expect(shownTotal.split("\n")[0]).toBe(
      new Intl.NumberFormat("en-US", { style: "currency", currency: rev!.currency }).format(rev!.total_minor / 100),
    );
    const sentLines = await sql<{ code: string; minutes: number }>(
      "select code, minutes from estimate_line l join estimate_revision r on r.id = l.revision_id where r.job_id = $1",
      [jobId],
    );
    expect(sentLines.find((l) => l.code === "inspect.intake")!.minutes).toBe(50);
    expect(sentLines.map((l) => l.code)).toContain("part.cord.dial");
    expect(sentLines.map((l) => l.code)).not.toContain("test.burn-in");

    // The owner approves and pays the deposit (their pages and the processor's webhook).
    await approveAndPayDeposit(jobId);
    await page.reload();
    await openTab(page, "Completion");
    await page.getByRole("button", { name: "Set received — start work" }).click();
    await expect.poll(() => stateBadge(page)).toContain("On the bench");

    // Bench sheet: cautions, live verdicts, Enter to save and move on. Nothing is ticked yet, so the sheet
    // proposes as received; these are the figures the set goes back with, so the technician switches.
    await openTab(page, "Bench sheet");
    expect(await page.getByLabel("As received", { exact: true }).isChecked()).toBe(true);
    await page.getByLabel("As returned", { exact: true }).check();
    const cautions = page.getByRole("list", { name: "Safety cautions" });
    await expect.poll(() => cautions.innerText()).toMatch(/isolation transformer/);
    expect(await cautions.innerText()).toMatch(/without the isolation transformer/);
    expect(await cautions.innerText()).toMatch(/through a resistor/);
    expect(await cautions.innerText()).toMatch(/current-limiting lamp or a variac/);
    const leakA = page.locator('tr[data-reading="leakage.plug-a"]');
    await leakA.locator("input").fill("0.8");
    await expect.poll(() => leakA.locator("span[data-verdict]").innerText()).toContain("Fail");
    await leakA.locator("input").fill("0.3");
    await expect.poll(() => leakA.locator("span[data-verdict]").innerText()).toContain("Pass");
    await leakA.locator("input").fill("0.8");
    await expect.poll(() => leakA.locator("span[data-verdict]").innerText()).toContain("Fail");
    await snap(page, "bench-04-live-verdict");

    const sheetRes = await page.request.get(`/api/bench/jobs/${jobId}/sheet`);
    const sheet = (await sheetRes.json()) as {
      requirements: { key: string; unit: string; nominal: number | null }[];
      tasks: { code: string }[];
    };
    const keys = sheet.requirements.map((r) => r.key);
    for (const [i, r] of sheet.requirements.entries()) {
      const input = page.locator(`tr[data-reading="${r.key}"] input`);
      // Frequencies typed with their unit, which every row takes (SW and FM rows otherwise read MHz).
      const typed = r.unit === "mA" ? "0.12" : r.unit === "kHz" ? `${r.nominal} kHz` : String(r.nominal ?? 118);
      if (r.key !== "leakage.plug-a") await input.fill(typed);
      const saved = page.waitForResponse(
        (res) => res.url().endsWith(`/api/bench/jobs/${jobId}/readings`) && res.request().method() === "POST",
      );
      await input.press("Enter");
      expect((await saved).status()).toBe(200);
      if (i + 1 < keys.length)
        await expect.poll(() => page.evaluate(() => document.activeElement?.closest("tr")?.getAttribute("data-reading"))).toBe(keys[i + 1]);
    }
    await expect.poll(async () => (await sql("select id from reading where job_id = $1", [jobId])).length).toBe(keys.length);
    const [failing] = await sql<{ verdict: string }>("select verdict from reading where job_id = $1 and key = 'leakage.plug-a'", [jobId]);
    expect(failing!.verdict).toBe("fail");

    for (const t of sheet.tasks) {
      const box = page.locator(`li[data-task="${t.code}"] input[type=checkbox]`);
      await box.check();
    }
    await expect
      .poll(async () => (await sql("select id from job_task where job_id = $1 and done_at is not null", [jobId])).length)
      .toBe(sheet.tasks.length);
    await expect.poll(() => page.locator("li[data-task]").filter({ hasText: "Done by Tomas" }).count()).toBe(sheet.tasks.length);

    // Completion: refused while the leakage reading fails.
    await openTab(page, "Completion");
    await page.getByRole("button", { name: "Start final checks" }).click();
    await expect.poll(() => stateBadge(page)).toContain("Final checks");
    await page.getByRole("button", { name: "Complete and ask for the balance" }).click();
    await expect.poll(() => page.getByText("The job cannot be completed yet").count()).toBe(1);
    const refusal = await page.getByRole("alert").filter({ hasText: "Not yet" }).innerText();
    expect(refusal).toMatch(/Leakage current, plug one way: 0.8 mA is outside the tolerance/);
    expect(await stateBadge(page)).toContain("Final checks");
    await snap(page, "bench-05-completion-refused");

    // Re-measure: the leakage now passes, and completion goes through.
    await openTab(page, "Bench sheet");
    const input = page.locator('tr[data-reading="leakage.plug-a"] input');
    await input.fill("0.14");
    await expect.poll(() => page.locator('tr[data-reading="leakage.plug-a"] span[data-verdict]').innerText()).toContain("Pass");
    const saved = page.waitForResponse((res) => res.url().endsWith(`/api/bench/jobs/${jobId}/readings`));
    await input.press("Enter");
    expect((await saved).status()).toBe(200);
    await openTab(page, "Completion");
    await expect.poll(() => page.getByText("Every required reading passes and every checklist line is ticked.").count()).toBe(1);
    await page.getByRole("button", { name: "Complete and ask for the balance" }).click();
    await expect.poll(() => page.getByText(/The owner has been asked to pay the balance/).count()).toBe(1);
    await expect.poll(() => stateBadge(page)).toContain("Balance due");
    await snap(page, "bench-06-completed");
    const [job] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    expect(job!.state).toBe("balance_due");
    await context.close();
  });
});

describe("two technicians editing one estimate", () => {
  it("tells the second one that someone else saved, keeps their edits and lets them save over it", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const [ctxA, ctxB] = [await newContext(browser), await newContext(browser)];
    const [a, b] = [await ctxA.newPage(), await ctxB.newPage()];
    await signInPage(a, DEMO.tech.email, DEMO.tech.password);
    await signInPage(b, DEMO.tech2.email, DEMO.tech2.password);
    for (const p of [a, b]) {
      await p.goto(`/bench/jobs/${jobId}`);
      await openTab(p, "Estimate");
      await expect.poll(() => p.locator('tr[data-line="inspect.intake"]').count()).toBe(1);
    }
    await a.locator('tr[data-line="inspect.intake"] input[id$="-num"]').fill("40");
    await a.getByRole("button", { name: "Save draft" }).click();
    await expect.poll(() => a.getByText("Saved (version 1).").count()).toBe(1);

    // B still has the computed draft; their edit is refused, not lost.
    await b.locator('tr[data-line="test.burn-in"] input[id$="-num"]').fill("90");
    await b.locator('tr[data-line="test.burn-in"] input[id$="-num"]').press("Enter");
    await expect.poll(() => b.getByRole("alert").filter({ hasText: "Nothing was overwritten" }).count()).toBe(1);
    expect(await b.locator('tr[data-line="test.burn-in"] input[id$="-num"]').inputValue()).toBe("90");
    await snap(b, "bench-09-estimate-stale");
    const [kept] = await sql<{ version: number; draft: { lines: { code: string; minutes: number }[] } }>(
      "select version, draft from estimate where job_id = $1",
      [jobId],
    );
    expect(kept!.version).toBe(1);
    expect(kept!.draft.lines.find((l) => l.code === "test.burn-in")!.minutes).toBe(30);

    await b.getByRole("button", { name: "Save mine over it" }).click();
    await expect.poll(() => b.getByText("Saved (version 2).").count()).toBe(1);
    const [after] = await sql<{ version: number; draft: { lines: { code: string; minutes: number }[] } }>(
      "select version, draft from estimate where job_id = $1",
      [jobId],
    );
    expect(after!.draft.lines.find((l) => l.code === "test.burn-in")!.minutes).toBe(90);
    await ctxA.close();
    await ctxB.close();
  });
});

describe("the alignment calculator", () => {
  it("plots the tracking error with every point and the three tracking points marked, with the engine's figures", async () => {
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInPage(page, DEMO.tech.email, DEMO.tech.password);
    await page.goto("/bench/calculator");
    await page.getByLabel("Dial low end").fill("540");
    await page.getByLabel("Dial high end").fill("1600");
    await page.getByLabel("IF", { exact: true }).fill("455");
    await page.getByLabel("Gang minimum").fill("10");
    await page.getByLabel("Gang maximum").fill("365");
    await page.getByRole("button", { name: "Calculate" }).click();
    await expect.poll(() => page.locator("[data-testid=alignment-result]").count()).toBe(1);

    const engine = runAlignmentTool(
      parseAlignmentRequest({ band: { lowKHz: 540, highKHz: 1600, kind: "MW" }, ifKHz: 455, gang: { minPF: 10, maxPF: 365 } }),
    );
    const design = engine.design!;
    await expect.poll(() => page.locator("[data-curve-point]").count()).toBe(design.errorCurve.length);
    expect(await page.locator("[data-tracking-point]").count()).toBe(3);
    expect(await page.locator("figure[data-points]").getAttribute("data-points")).toBe(String(design.errorCurve.length));

    const figures: Record<string, number | null> = {
      "lo.lowKHz": engine.lo.lowKHz,
      "lo.highKHz": engine.lo.highKHz,
      "image.lowKHz": engine.image.lowKHz,
      "image.highKHz": engine.image.highKHz,
      "capacitanceRatio.signal": engine.capacitanceRatio.signal,
      "capacitanceRatio.oscillator": engine.capacitanceRatio.oscillator,
      "trackingPointsKHz.0": engine.trackingPointsKHz[0],
      "trackingPointsKHz.1": engine.trackingPointsKHz[1],
      "trackingPointsKHz.2": engine.trackingPointsKHz[2],
      "design.signalInductanceUH": design.signalInductanceUH,
      "design.signalFixedPF": design.signalFixedPF,
      "design.signalTrimmerPF": design.signalTrimmerPF,
      "design.padderPF": design.padderPF,
      "design.oscillatorFixedPF": design.oscillatorFixedPF,
      "design.oscillatorTrimmerPF": design.oscillatorTrimmerPF,
      "design.oscillatorInductanceUH": design.oscillatorInductanceUH,
      "design.maxAbsErrorKHz": design.maxAbsErrorKHz,
      "design.sensitivityLossDb": design.sensitivityLossDb,
    };
    for (const [name, value] of Object.entries(figures)) {
      expect(await page.locator(`[data-figure="${name}"]`).innerText(), name).toBe(formatNumber(value!, 2));
    }
    expect(await page.locator('[data-figure="design.minimax.sensitivityLossDb"]').innerText()).toBe(
      `${formatNumber(design.minimax!.sensitivityLossDb, 2)} dB`,
    );
    const steps = await page.getByRole("heading", { name: "Order of adjustments" }).locator("xpath=following-sibling::ol/li").count();
    expect(steps).toBe(engine.steps.length);
    await snap(page, "bench-07-calculator");

    // FM (common practice: FM front ends use no padder): coils in nH to three figures, and no padder shown.
    await page.getByLabel("Band kind").selectOption("FM");
    await page.getByLabel("Dial low end").fill("88 MHz");
    await page.getByLabel("Dial high end").fill("108 MHz");
    await page.getByLabel("IF", { exact: true }).fill("10.7 MHz");
    await page.getByLabel("Gang minimum").fill("5");
    await page.getByLabel("Gang maximum").fill("20");
    await page.getByRole("button", { name: "Calculate" }).click();
    const fm = runAlignmentTool(
      parseAlignmentRequest({ band: { lowKHz: 88000, highKHz: 108000, kind: "FM" }, ifKHz: 10700, gang: { minPF: 5, maxPF: 20 } }),
    );
    await expect.poll(() => page.locator('[data-figure="design.signalInductanceNH"]').count()).toBe(1);
    expect(await page.locator('[data-figure="design.signalInductanceNH"]').innerText()).toBe(
      String(Number((fm.design!.signalInductanceUH * 1000).toPrecision(3))),
    );
    expect(await page.locator('[data-figure="design.padderPF"]').count()).toBe(0);
    expect(await page.locator('[data-figure="design.signalInductanceUH"]').count()).toBe(0);
    await page.getByLabel("Band kind").selectOption("MW");
    await page.getByLabel("Dial low end").fill("540");
    await page.getByLabel("IF", { exact: true }).fill("455");

    // Bad input is refused field by field, before anything is computed.
    await page.getByLabel("Dial high end").fill("500");
    await page.getByRole("button", { name: "Calculate" }).click();
    await expect.poll(() => page.getByText("The high end must be above the low end.").count()).toBe(1);
    await context.close();
  });

  it("appears on the job page with the set's own bands", async () => {
    const { jobId } = await createJob({
      state: "on_bench",
      profile: {
        ...AURELIAN_PROFILE,
        bands: [
          { kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455 },
          { kind: "SW", lowKHz: 5900, highKHz: 18000, ifKHz: 455, label: "Shortwave" },
        ],
      },
    });
    const context = await newContext(browser);
    const page = await context.newPage();
    await signInPage(page, DEMO.tech.email, DEMO.tech.password);
    await page.goto(`/bench/jobs/${jobId}`);
    await openTab(page, "Alignment");
    await page.getByLabel("Band from the set profile").selectOption({ index: 1 });
    expect(await page.getByLabel("Dial low end").inputValue()).toBe("5900");
    await page.getByLabel("Gang minimum").fill("12");
    await page.getByLabel("Gang maximum").fill("365");
    await page.getByRole("button", { name: "Calculate" }).click();
    await expect.poll(() => page.locator("[data-tracking-point]").count()).toBe(3);
    const engine = runAlignmentTool(
      parseAlignmentRequest({
        band: { lowKHz: 5900, highKHz: 18000, kind: "SW" },
        ifKHz: 455,
        gang: { minPF: 12, maxPF: 365 },
        hotChassis: true,
      }),
    );
    expect(await page.locator("[data-curve-point]").count()).toBe(engine.design!.errorCurve.length);
    expect(await page.locator('[data-figure="design.padderPF"]').innerText()).toBe(formatNumber(engine.design!.padderPF!, 2));
    // An AC/DC set: the isolation-transformer caution shows above the plan and opens it.
    expect(await page.locator("[data-caution=isolation-transformer]").count()).toBe(1);
    expect(
      await page.getByRole("heading", { name: "Order of adjustments" }).locator("xpath=following-sibling::ol/li").first().innerText(),
    ).toMatch(/isolation transformer/);
    await snap(page, "bench-08-job-alignment-panel");
    await context.close();
  });
});
