import fc from "fast-check";
import { evaluate } from "mathjs";
import { describe, expect, test } from "vitest";
import {
  dbmToMicrovolts,
  dbuvToMicrovolts,
  defaultPerformanceSetup,
  judgePerformance,
  listPerformanceReadings,
  microvoltsToDbm,
  microvoltsToDbuv,
  milliwattsToVolts,
  performanceKey,
  toMicrovolts,
  toMilliwatts,
  voltsToMilliwatts,
} from "@/lib/engine/performance";
import { judgeReading, readingValueProblem } from "@/lib/engine/verdicts";
import { aurelianTableSet, corvanePortable, haldaneConsole } from "./support/demo-sets";

describe("signal units against their definitions", () => {
  test("1 µV is 0 dBµV and 1 mV is 60 dBµV (definition: dBµV = 20·log10(V / 1 µV))", () => {
    expect(microvoltsToDbuv(1)).toBe(0);
    expect(microvoltsToDbuv(1000)).toBeCloseTo(60, 12);
    expect(dbuvToMicrovolts(0)).toBe(1);
    expect(dbuvToMicrovolts(20)).toBeCloseTo(10, 12);
  });

  test("0 dBm into 50 Ω is 223.6 mV rms (definition: 0 dBm = 1 mW, V = √(P·R); oracle mathjs units)", () => {
    expect(dbmToMicrovolts(0) / 1000).toBeCloseTo(223.6, 1);
    const oracle = evaluate("sqrt(1 mW * 50 ohm)").toNumber("uV") as number;
    expect(dbmToMicrovolts(0)).toBeCloseTo(oracle, 6);
    // −107 dBm into 50 Ω is the familiar "about 1 µV" (common practice: 0 dBµV ≈ −107 dBm at 50 Ω).
    expect(microvoltsToDbm(1)).toBeCloseTo(-107, 0);
    expect(microvoltsToDbm(dbmToMicrovolts(-73))).toBeCloseTo(-73, 9);
  });

  test("50 mW into 8 Ω is 0.632 V rms (definition: P = V²/R; oracle mathjs units)", () => {
    expect(milliwattsToVolts(50, 8)).toBeCloseTo(0.632, 3);
    expect(milliwattsToVolts(50, 8)).toBeCloseTo(evaluate("sqrt(50 mW * 8 ohm)").toNumber("V") as number, 12);
    expect(voltsToMilliwatts(0.632455532, 8)).toBeCloseTo(50, 6);
    expect(toMilliwatts(2, "V", 4)).toBeCloseTo(evaluate("(2 V)^2 / (4 ohm)").toNumber("mW") as number, 9);
  });

  test("a generator level in any unit comes back as µV (definitions above)", () => {
    expect(toMicrovolts(6, "dBµV")).toBeCloseTo(1.995, 3);
    expect(toMicrovolts(0, "dBm")).toBeCloseTo(223_607, 0);
    expect(() => toMicrovolts(-1, "µV")).toThrow(/above zero/);
  });

  test("dBµV and µV are inverse over the bench's whole range (property, fast-check)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 1e6, noNaN: true }), (uv) => {
        expect(dbuvToMicrovolts(microvoltsToDbuv(uv)) / uv).toBeCloseTo(1, 9);
        // dBm and dBµV into 50 Ω differ by a constant: 10·log10(1 mW · 50 Ω / 1 µV²) = 107.0 dB (from the definitions).
        expect(microvoltsToDbuv(uv) - microvoltsToDbm(uv)).toBeCloseTo(10 * Math.log10(50e-3 / 1e-12), 9);
      }),
    );
  });
});

describe("performance verdicts", () => {
  test("without a service figure a reading is recorded, never passed (the product rule)", () => {
    const j = judgePerformance("higher", null, "dB", 40);
    expect(j.verdict).toBe("recorded");
    expect(j.toleranceText).toBe("recorded, no service figure entered");
  });

  test("sensitivity is better lower: 8 µV meets a 10 µV figure, 12 µV does not (the reading is the input needed)", () => {
    expect(judgePerformance("lower", 10, "µV", 8).verdict).toBe("pass");
    expect(judgePerformance("lower", 10, "µV", 12).verdict).toBe("fail");
    expect(judgePerformance("lower", 10, "µV", 8).toleranceText).toBe("at most 10 µV (the set's service figure)");
  });

  test("signal-to-noise is better higher: 30 dB meets a 26 dB figure, 20 dB does not", () => {
    expect(judgePerformance("higher", 26, "dB", 30).verdict).toBe("pass");
    expect(judgePerformance("higher", 26, "dB", 20).verdict).toBe("fail");
    expect(judgePerformance("higher", 26, "dB", 30).toleranceText).toBe("at least 26 dB (the set's service figure)");
  });

  test("output-stage bias sits within ±20 % of its figure (common practice)", () => {
    expect(judgePerformance("near", 150, "mV", 175).verdict).toBe("pass");
    expect(judgePerformance("near", 150, "mV", 185).verdict).toBe("fail");
  });

  test("a missing value is missing, figure or not", () => {
    expect(judgePerformance("lower", 10, "µV", null).verdict).toBe("missing");
  });
});

describe("performance readings offered by set kind", () => {
  const on = { ...defaultPerformanceSetup, enabled: true };

  test("nothing is offered until the technician opts in for the job", () => {
    expect(listPerformanceReadings(aurelianTableSet, defaultPerformanceSetup)).toEqual([]);
  });

  test("a tube set: three sensitivity points per band, the audio figures and one tester line per tube (5 tubes)", () => {
    const keys = listPerformanceReadings(aurelianTableSet, on).map((r) => r.key);
    expect(keys).toEqual([
      performanceKey.sensitivity(0, "low"),
      performanceKey.sensitivity(0, "mid"),
      performanceKey.sensitivity(0, "high"),
      "perf.snr",
      "perf.avc",
      "perf.max-output",
      "perf.hum",
      "perf.tube.1",
      "perf.tube.2",
      "perf.tube.3",
      "perf.tube.4",
      "perf.tube.5",
    ]);
    const sens = listPerformanceReadings(aurelianTableSet, on)[0]!;
    // The usual AM reference output (common practice, from memory): 50 mW at 30 % modulation at 400 Hz.
    expect(sens.label).toMatch(/input for 50 mW into 8 ohms at 30 % at 400 Hz/);
    expect(sens.tolerance.kind).toBe("recorded");
  });

  test("a transistor set gets idle current and output-stage bias, and no tube tests", () => {
    const keys = listPerformanceReadings(corvanePortable, on).map((r) => r.key);
    expect(keys).toContain("perf.idle-current");
    expect(keys).toContain("perf.output-bias");
    expect(keys.some((k) => k.startsWith("perf.tube."))).toBe(false);
  });

  test("a four-band console: sensitivity on every band, FM without a modulation depth", () => {
    const list = listPerformanceReadings(haldaneConsole, on);
    expect(list.filter((r) => r.lineCode.startsWith("perf.sensitivity.")).length).toBe(12);
    const fm = list.find((r) => r.key === performanceKey.sensitivity(3, "mid"))!;
    expect(fm.label).not.toMatch(/% at/);
    expect(list.filter((r) => r.key.startsWith("perf.tube.")).length).toBe(10);
  });

  test("an entered figure turns a recorded line into a judged one in the right direction", () => {
    const list = listPerformanceReadings(aurelianTableSet, {
      ...on,
      figures: { "perf.snr": 26, [performanceKey.sensitivity(0, "mid")]: 50 },
    });
    const snr = list.find((r) => r.key === "perf.snr")!;
    expect(judgeReading(snr, 20).verdict).toBe("fail");
    expect(judgeReading(snr, 26).verdict).toBe("pass");
    const mid = list.find((r) => r.key === performanceKey.sensitivity(0, "mid"))!;
    expect(judgeReading(mid, 40).verdict).toBe("pass");
    expect(judgeReading(mid, 60).verdict).toBe("fail");
    const tube = list.find((r) => r.key === "perf.tube.1")!;
    expect(tube.toleranceText).toBe("recorded, no service figure entered");
  });

  test("bad values name what is allowed", () => {
    const sens = listPerformanceReadings(aurelianTableSet, on)[0]!;
    expect(readingValueProblem(sens, 0)).toMatch(/above zero µV/);
    expect(readingValueProblem(sens, -3)).toMatch(/not below zero/);
    expect(readingValueProblem(sens, 12)).toBeNull();
  });
});
