import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { computeChecklist } from "@/lib/engine/checklist";
import { setProfileSchema } from "@/lib/engine/checklist/profile";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import {
  defaultTolerances,
  describeTolerance,
  judgeReading,
  judgeReadings,
  listRequiredReadings,
  parseReadingKey,
  readingValueProblem,
  readingKey,
  type ReadingRequirement,
} from "@/lib/engine/verdicts";
import { parseReadingText } from "@/lib/validation/bench";
import { aurelianTableSet, corvanePortable, haldaneConsole } from "./support/demo-sets";

const req = (key: string, profile = aurelianTableSet): ReadingRequirement => {
  const r = listRequiredReadings(profile, defaultTolerances).find((x) => x.key === key);
  if (!r) throw new Error(`no requirement ${key}`);
  return r;
};

describe("tolerances", () => {
  test("MW dial point within max(10 kHz, 1 % of reading) of the mark (common practice, a shop proposal)", () => {
    const low = req(readingKey.edgeLow(0));
    expect(low.toleranceText).toBe(
      "within ±10 kHz or 1 % of the mark, whichever is larger; dial calibration, read as the received frequency",
    );
    expect(low.label).toMatch(/dial calibration at the low band edge/);
    expect(judgeReading(low, 550).verdict).toBe("pass");
    expect(judgeReading(low, 550.5).verdict).toBe("fail");
    const high = req(readingKey.edgeHigh(0));
    expect(judgeReading(high, 1616).verdict).toBe("pass"); // 1 % of 1600 = 16 kHz
    expect(judgeReading(high, 1617).verdict).toBe("fail");
  });

  test("LO at a mark: the same dial-calibration window around mark + IF (REFERENCES.md tolerances: received = LO − IF, one error, one verdict)", () => {
    const lo = req(readingKey.loLow(0));
    expect(lo.nominal).toBe(580 + 455);
    expect(lo.toleranceText).toBe(
      "within ±10 kHz of the target (mark 580 kHz + IF 455 kHz); dial calibration at this mark, read on the LO (received = LO − IF)",
    );
    expect(lo.label).toMatch(/dial calibration at the 580 kHz mark, LO frequency/);
    expect(judgeReading(lo, 1045).verdict).toBe("pass");
    expect(judgeReading(lo, 1045.1).verdict).toBe("fail");
  });

  test("property: a dial error read as the received frequency and read on the LO gets one verdict, on MW and SW (REFERENCES.md tolerances)", () => {
    for (const [profile, band] of [
      [aurelianTableSet, 0],
      [haldaneConsole, 1],
    ] as const) {
      const pairs = [
        [readingKey.track(band, 0), readingKey.loLow(band)],
        [readingKey.track(band, 2), readingKey.loHigh(band)],
      ] as const;
      for (const [trackKey, loKey] of pairs) {
        const track = req(trackKey, profile);
        const lo = req(loKey, profile);
        const ifKHz = lo.nominal! - track.nominal!;
        expect(profile.bands[band]!.ifKHz).toBe(ifKHz);
        fc.assert(
          fc.property(fc.double({ min: -0.05, max: 0.05, noNaN: true }), (fraction) => {
            const error = fraction * track.nominal!;
            expect(judgeReading(lo, track.nominal! + ifKHz + error).verdict).toBe(judgeReading(track, track.nominal! + error).verdict);
          }),
        );
      }
    }
  });

  test("the service manual's own tracking points, when the profile gives them, are the marks", () => {
    const profile = {
      ...aurelianTableSet,
      bands: [{ ...aurelianTableSet.bands[0]!, trackingPointsKHz: [600, 1000, 1400] as [number, number, number] }],
    };
    expect(req(readingKey.track(0, 1), profile).nominal).toBe(1000);
    expect(req(readingKey.loHigh(0), profile).nominal).toBe(1400 + 455);
    // As typed on the triage form, units allowed; out of order or off the band is refused on the field.
    const band = { kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455 };
    const parsed = setProfileSchema.parse({ ...aurelianTableSet, bands: [{ ...band, trackingPointsKHz: "600, 1000, 1.4 MHz" }] });
    expect(parsed.bands[0]!.trackingPointsKHz).toEqual([600, 1000, 1400]);
    expect(
      setProfileSchema.parse({ ...aurelianTableSet, bands: [{ ...band, trackingPointsKHz: "" }] }).bands[0]!.trackingPointsKHz,
    ).toBeUndefined();
    const bad = setProfileSchema.safeParse({ ...aurelianTableSet, bands: [{ ...band, trackingPointsKHz: "1000, 600, 1400" }] });
    expect(bad.success ? [] : bad.error.issues.map((i) => i.path.join("."))).toContain("bands.0.trackingPointsKHz.1");
  });

  test("SW dial point within 2 % of reading (common practice)", () => {
    const edge = req(readingKey.edgeHigh(1), haldaneConsole);
    expect(edge.toleranceText).toBe("within ±2 % of the mark; dial calibration, read as the received frequency");
    expect(edge.entryUnit).toBe("MHz");
    expect(judgeReading(edge, 7300 * 1.02).verdict).toBe("pass");
    expect(judgeReading(edge, 7300 * 1.021).verdict).toBe("fail");
  });

  test("leakage on a two-wire 120 V set at most 0.5 mA (published: US service-manual hot-check procedure; UL 101 family limits)", () => {
    const leak = req(readingKey.leakagePlugA);
    expect(leak.toleranceText).toBe("at most 0.5 mA");
    expect(judgeReading(leak, 0.5).verdict).toBe("pass");
    expect(judgeReading(leak, 0.51).verdict).toBe("fail");
  });

  test("leakage on 230 V sets: at most 0.49 mA rms, IEC 60065 Annex D's 0.7 mA peak on a sine (published: IEC 60065 Annex D)", () => {
    const leak = req(readingKey.leakagePlugB, { ...aurelianTableSet, mainsVolts: 230 });
    expect(leak.toleranceText).toBe("at most 0.49 mA");
    expect(judgeReading(leak, 0.49).verdict).toBe("pass");
    // 0.5 mA rms is 0.707 mA peak, over the 0.7 mA peak of the standard.
    expect(judgeReading(leak, 0.5).verdict).toBe("fail");
  });

  test("missing readings are missing, never pass", () => {
    const r = req(readingKey.edgeLow(0));
    expect(judgeReading(r, null).verdict).toBe("missing");
    expect(judgeReading(r, undefined).verdict).toBe("missing");
    expect(judgeReading(r, Number.NaN).verdict).toBe("missing");
  });

  test("B+ with no schematic figure is recorded, never passed; with one it is judged ±10 %; the mains at the time is recorded with it (common practice: B+ follows the mains)", () => {
    const free = req(readingKey.bPlus);
    expect(free.toleranceText).toBe("recorded, no figure to judge against");
    expect(judgeReading(free, 250).verdict).toBe("recorded");
    expect(judgeReading(req(readingKey.bPlusMains), 118).verdict).toBe("recorded");
    expect(req(readingKey.bPlusMains).lineCode).toBe("test.voltages");
    const b = req(readingKey.bPlus, haldaneConsole);
    expect(b.toleranceText).toBe("within ±10 % of the schematic value");
    expect(judgeReading(b, 270).verdict).toBe("pass");
    expect(judgeReading(b, 280).verdict).toBe("fail");
  });

  test("wording for each tolerance shape", () => {
    expect(describeTolerance({ kind: "window", absKHz: 5, percent: 0, reference: "mark" })).toBe("within ±5 kHz of the mark");
    expect(describeTolerance({ kind: "max", limit: 0.75, unit: "mA" })).toBe("at most 0.75 mA");
  });
});

describe("reading keys and the bench sheet", () => {
  test("keys round-trip through the parser", () => {
    expect(parseReadingKey("if.peak.455")).toEqual({ kind: "if-peak", ifKHz: 455 });
    expect(parseReadingKey("if.peak.10700")).toEqual({ kind: "if-peak", ifKHz: 10700 });
    expect(parseReadingKey("band.2.edge.high")).toEqual({ kind: "edge", band: 2, end: "high" });
    expect(parseReadingKey("band.0.lo.low")).toEqual({ kind: "lo", band: 0, end: "low" });
    expect(parseReadingKey("band.1.track.2")).toEqual({ kind: "track", band: 1, point: 2 });
    expect(parseReadingKey("leakage.plug-b")).toEqual({ kind: "leakage", plug: "b" });
    expect(parseReadingKey("bplus")).toEqual({ kind: "bplus" });
    expect(parseReadingKey("bplus.mains")).toEqual({ kind: "bplus-mains" });
    expect(parseReadingKey("band.x.edge.low")).toBeNull();
  });

  // Common practice: a band is aligned at three points and its dial checked there and at both edges; a mains
  // set gets the leakage test both ways round; a tube set's B+ is read with the mains beside it.
  test("every requirement sits on a line the checklist's rules produce, and each band gets its five dial readings and two LO readings", () => {
    for (const p of [aurelianTableSet, corvanePortable, haldaneConsole]) {
      const lines = computeChecklist(p, defaultShopPolicy);
      const reqs = listRequiredReadings(p, defaultTolerances);
      for (const r of reqs)
        expect(
          lines.some((l) => l.code === r.lineCode),
          r.key,
        ).toBe(true);
      for (const r of reqs) expect(parseReadingKey(r.key)).not.toBeNull();
      p.bands.forEach((_, i) => {
        const keys = reqs.filter((r) => r.lineCode === `align.tracking.${i}` || r.lineCode === `align.dial.${i}`).map((r) => r.key);
        expect(keys.sort()).toEqual(
          [
            `band.${i}.lo.low`,
            `band.${i}.lo.high`,
            `band.${i}.track.0`,
            `band.${i}.track.1`,
            `band.${i}.track.2`,
            `band.${i}.edge.low`,
            `band.${i}.edge.high`,
          ].sort(),
        );
      });
      const keys = reqs.map((r) => r.key);
      expect(keys.includes("leakage.plug-a") && keys.includes("leakage.plug-b")).toBe(p.kind !== "transistor-battery");
      expect(keys.includes("bplus.mains")).toBe(p.kind.startsWith("tube"));
    }
  });

  test("completion gate: complete only when nothing is missing or failing", () => {
    const reqs = listRequiredReadings(aurelianTableSet, defaultTolerances);
    const good = Object.fromEntries(reqs.map((r) => [r.key, r.nominal ?? 0.1]));
    expect(judgeReadings(reqs, good).complete).toBe(true);
    const { [readingKey.leakagePlugB]: _dropped, ...withoutLeak } = good;
    const missing = judgeReadings(reqs, withoutLeak);
    expect(missing.complete).toBe(false);
    expect(missing.missing).toEqual([readingKey.leakagePlugB]);
    const failing = judgeReadings(reqs, { ...good, [readingKey.leakagePlugA]: 0.9 });
    expect(failing.failing).toEqual([readingKey.leakagePlugA]);
    expect(failing.complete).toBe(false);
  });
});

describe("readings are physical", () => {
  // Common practice: a frequency, current or voltage reading is never below zero, and a reading typed in the
  // wrong unit (0.58 for the 580 kHz mark) is a typing error, not an out-of-tolerance set.
  test("negative or wrong-unit frequencies are bad input, naming what was meant", () => {
    const mark = req(readingKey.track(0, 0));
    expect(mark.nominal).toBe(580);
    expect(readingValueProblem(mark, -580)).toMatch(/above zero/);
    expect(readingValueProblem(mark, 0.58)).toMatch(/0\.58 MHz/);
    expect(readingValueProblem(mark, 592)).toBeNull();
    expect(judgeReading(mark, 592).verdict).toBe("fail");
    expect(readingValueProblem(req(readingKey.leakagePlugA), -0.1)).toMatch(/not below zero/);
    expect(readingValueProblem(req(readingKey.bPlusMains), 11.8)).toMatch(/50 and 300 V/);
  });

  test("frequency readings take units; SW and FM rows are typed in MHz and stored in kHz", () => {
    const mw = req(readingKey.track(0, 0));
    expect(parseReadingText("1.49 MHz", mw)).toBe(1490);
    expect(parseReadingText("455 kHz", mw)).toBe(455);
    expect(parseReadingText("455k", mw)).toBe(455);
    expect(parseReadingText("1,003.5", mw)).toBe(1003.5);
    expect(parseReadingText("12 parsecs", mw)).toBeUndefined();
    const sw = req(readingKey.edgeHigh(1), haldaneConsole);
    expect(parseReadingText("7.3", sw)).toBe(7300);
    expect(parseReadingText("7300 kHz", sw)).toBe(7300);
    expect(readingValueProblem(sw, parseReadingText("7300", sw)!)).toMatch(/takes MHz/);
    expect(parseReadingText("0.21 mA", req(readingKey.leakagePlugA))).toBe(0.21);
  });
});
