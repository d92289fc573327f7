import { describe, expect, test } from "vitest";
import { computeChecklist } from "@/lib/engine/checklist";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import {
  defaultTolerances,
  describeTolerance,
  judgeReading,
  judgeReadings,
  listRequiredReadings,
  parseReadingKey,
  readingKey,
  type ReadingRequirement,
} from "@/lib/engine/verdicts";
import { aurelianTableSet, corvanePortable, haldaneConsole } from "./support/demo-sets";

const req = (key: string, profile = aurelianTableSet): ReadingRequirement => {
  const r = listRequiredReadings(profile, defaultTolerances).find((x) => x.key === key);
  if (!r) throw new Error(`no requirement ${key}`);
  return r;
};

describe("tolerances", () => {
  test("MW dial point within max(10 kHz, 1 % of reading) of the mark (common practice, a shop proposal)", () => {
    const low = req(readingKey.edgeLow(0));
    expect(low.toleranceText).toBe("within ±10 kHz or 1 % of the mark, whichever is larger");
    expect(judgeReading(low, 550).verdict).toBe("pass");
    expect(judgeReading(low, 550.5).verdict).toBe("fail");
    const high = req(readingKey.edgeHigh(0));
    expect(judgeReading(high, 1616).verdict).toBe("pass"); // 1 % of 1600 = 16 kHz
    expect(judgeReading(high, 1617).verdict).toBe("fail");
  });

  test("LO at an alignment point within ±2 kHz of mark + IF (common practice)", () => {
    const lo = req(readingKey.loLow(0));
    expect(lo.nominal).toBe(580 + 455);
    expect(lo.toleranceText).toBe("within ±2 kHz of the target (mark + IF 455 kHz)");
    expect(judgeReading(lo, 1037).verdict).toBe("pass");
    expect(judgeReading(lo, 1037.1).verdict).toBe("fail");
  });

  test("SW dial point within 2 % of reading (common practice)", () => {
    const edge = req(readingKey.edgeHigh(1), haldaneConsole);
    expect(edge.toleranceText).toBe("within ±2 % of the mark");
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

  test("B+ is recorded, or judged ±10 % against a schematic figure", () => {
    expect(req(readingKey.bPlus).toleranceText).toBe("recorded, no limit");
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
    expect(parseReadingKey("band.x.edge.low")).toBeNull();
  });

  test("every checklist reading has a requirement and every requirement belongs to a line", () => {
    for (const p of [aurelianTableSet, corvanePortable, haldaneConsole]) {
      const lines = computeChecklist(p, defaultShopPolicy);
      const reqs = listRequiredReadings(p, defaultTolerances);
      expect(lines.flatMap((l) => l.readings)).toEqual(reqs.map((r) => r.key));
      for (const r of reqs) expect(lines.find((l) => l.code === r.lineCode)?.readings).toContain(r.key);
      for (const r of reqs) expect(parseReadingKey(r.key)).not.toBeNull();
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
