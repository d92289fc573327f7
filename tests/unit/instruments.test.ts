import fc from "fast-check";
import { describe, expect, test } from "vitest";
import {
  defaultReadingPhase,
  INSTRUMENT_KINDS,
  instrumentKindsFor,
  isCalibrationOverdue,
  proposedInstrument,
  type InstrumentKind,
} from "@/lib/engine/instruments";
import { defaultTolerances, listRequiredReadings } from "@/lib/engine/verdicts";
import { instrumentCreateSchema, instrumentUpdateSchema } from "@/lib/validation/instruments";
import { aurelianTableSet, haldaneConsole } from "./support/demo-sets";

const all = [...listRequiredReadings(haldaneConsole, defaultTolerances), ...listRequiredReadings(aurelianTableSet, defaultTolerances)];
const usual = (key: string) => instrumentKindsFor(all.find((r) => r.key === key)!)[0];

describe("which instrument a reading is taken with (common practice on the bench)", () => {
  test("a dial mark's received frequency: the signal generator the set is tuned to, or a counter on it", () => {
    for (const r of all.filter((x) => /^band\.\d+\.(edge\.(low|high)|track\.\d)$/.test(x.key)))
      expect(instrumentKindsFor(r), r.key).toEqual(["signal_generator", "frequency_counter"]);
  });

  test("the local oscillator is read with a frequency counter, loosely coupled", () => {
    const lo = all.filter((x) => /\.lo\./.test(x.key));
    expect(lo.length).toBeGreaterThan(0);
    for (const r of lo) expect(instrumentKindsFor(r)[0]).toBe("frequency_counter");
  });

  test("the IF peak: a signal generator first, a sweep generator with its display also fits", () => {
    expect(instrumentKindsFor({ key: "if.peak.455", unit: "kHz" })).toEqual(["signal_generator", "sweep_generator", "frequency_counter"]);
  });

  test("leakage current: a leakage tester (or a meter across the measuring network); voltages: a meter", () => {
    expect(usual("leakage.plug-a")).toBe("leakage_tester");
    expect(usual("leakage.plug-b")).toBe("leakage_tester");
    expect(instrumentKindsFor({ key: "bplus", unit: "V" })).toEqual(["meter"]);
    expect(instrumentKindsFor({ key: "bplus.mains", unit: "V" })).toEqual(["meter"]);
  });

  test("a reading the table does not know is offered by its unit: frequencies a generator or counter, volts a meter", () => {
    expect(instrumentKindsFor({ key: "if.bandwidth.3db", unit: "kHz" })).toEqual(["signal_generator", "frequency_counter"]);
    expect(instrumentKindsFor({ key: "output.hum", unit: "V" })).toEqual(["meter"]);
    expect(instrumentKindsFor({ key: "sensitivity", unit: "µV" })).toEqual(INSTRUMENT_KINDS);
  });

  test("a tube tester and an oscilloscope are never a reading's usual instrument (they check parts and shapes, not these figures)", () => {
    for (const r of all) {
      expect(instrumentKindsFor(r)[0]).not.toBe("tube_tester");
      expect(instrumentKindsFor(r)[0]).not.toBe("oscilloscope");
    }
  });
});

describe("calibration due dates (common practice: in calibration through the due date on the label)", () => {
  test("the due date itself is still in calibration; the day after is overdue", () => {
    expect(isCalibrationOverdue("2026-06-30", "2026-06-30")).toBe(false);
    expect(isCalibrationOverdue("2026-06-30", "2026-07-01")).toBe(true);
    expect(isCalibrationOverdue("2026-12-31", "2027-01-01")).toBe(true);
    expect(isCalibrationOverdue("2026-06-30", "2026-01-15")).toBe(false);
  });

  test("agrees with date arithmetic from the platform's Date for any pair of days", () => {
    const day = fc.integer({ min: 0, max: 60_000 }).map((n) => new Date(Date.UTC(1970, 0, 1) + n * 86_400_000).toISOString().slice(0, 10));
    fc.assert(
      fc.property(day, day, (due, taken) => {
        expect(isCalibrationOverdue(due, taken)).toBe(Date.parse(taken) > Date.parse(due));
      }),
    );
  });
});

describe("as received or as returned", () => {
  test("a set just on the bench, nothing done yet, is measured as received (common practice: intake figures before any work)", () => {
    expect(defaultReadingPhase({ state: "on_bench", linesTicked: 0 })).toBe("as_received");
    expect(defaultReadingPhase({ state: "bench_revision", linesTicked: 0 })).toBe("as_received");
  });
  test("once work has begun, and at final checks, readings describe the set as it goes back", () => {
    expect(defaultReadingPhase({ state: "on_bench", linesTicked: 1 })).toBe("as_returned");
    expect(defaultReadingPhase({ state: "final_checks", linesTicked: 0 })).toBe("as_returned");
    expect(defaultReadingPhase({ state: "final_checks", linesTicked: 7 })).toBe("as_returned");
  });
});

describe("the instrument a row proposes", () => {
  const offered: { id: string; kind: InstrumentKind }[] = [
    { id: "sg", kind: "signal_generator" },
    { id: "fc", kind: "frequency_counter" },
    { id: "m", kind: "meter" },
  ];
  test("the last choice for the row's usual kind, else for its next kind", () => {
    expect(
      proposedInstrument(["signal_generator", "frequency_counter"], { signal_generator: "sg", frequency_counter: "fc" }, offered),
    ).toBe("sg");
    expect(proposedInstrument(["signal_generator", "frequency_counter"], { frequency_counter: "fc" }, offered)).toBe("fc");
  });
  test("never an instrument no longer offered (retired), nor one of another kind", () => {
    expect(proposedInstrument(["signal_generator"], { signal_generator: "retired-one" }, offered)).toBeNull();
    expect(proposedInstrument(["meter"], { signal_generator: "sg" }, offered)).toBeNull();
  });
});

describe("the register's form", () => {
  const ok = {
    kind: "signal_generator",
    maker: "Port Alder Instruments",
    model: "SG-40",
    serial: "PAI-40-0117",
    calibratedOn: "2026-03-10",
    calibrationDueOn: "2027-03-10",
  };
  test("takes an instrument as the shop writes it", () => {
    expect(instrumentCreateSchema.safeParse(ok).success).toBe(true);
  });
  test("names the field and what is allowed", () => {
    const kind = instrumentCreateSchema.safeParse({ ...ok, kind: "voltmeter" });
    expect(kind.error?.issues[0]?.path).toEqual(["kind"]);
    expect(kind.error?.issues[0]?.message).toMatch(/signal generator.*leakage tester.*tube tester/);
    // 2026 is not a leap year (Gregorian rule: divisible by 4, not by 100 unless by 400).
    const feb = instrumentCreateSchema.safeParse({ ...ok, calibratedOn: "2026-02-29" });
    expect(feb.error?.issues[0]?.path).toEqual(["calibratedOn"]);
    const before = instrumentCreateSchema.safeParse({ ...ok, calibrationDueOn: "2026-03-09" });
    expect(before.error?.issues[0]).toMatchObject({ path: ["calibrationDueOn"], message: expect.stringMatching(/cannot be before/) });
    expect(instrumentCreateSchema.safeParse({ ...ok, serial: "  " }).error?.issues[0]?.path).toEqual(["serial"]);
  });
  test("a new calibration needs both dates; an update must change something", () => {
    expect(instrumentUpdateSchema.safeParse({ retired: true }).success).toBe(true);
    expect(instrumentUpdateSchema.safeParse({ calibratedOn: "2026-03-10" }).success).toBe(false);
    expect(instrumentUpdateSchema.safeParse({}).success).toBe(false);
    expect(instrumentUpdateSchema.safeParse({ calibratedOn: "2026-03-10", calibrationDueOn: "2027-03-10" }).success).toBe(true);
  });
});
