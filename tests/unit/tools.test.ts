import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { EngineError } from "@/lib/engine/engine-error";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import { defaultPartsCatalogue } from "@/lib/engine/pricing/parts";
import {
  alignmentRequestSchema,
  parseAlignmentRequest,
  estimateRequestSchema,
  fieldErrors,
  invalidInputBody,
  runAlignmentTool,
  runEstimateTool,
} from "@/lib/engine/requests";
import { aurelianTableSet } from "./support/demo-sets";

function allNumbersFinite(value: unknown): boolean {
  if (typeof value === "number") return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(allNumbersFinite);
  if (value && typeof value === "object") return Object.values(value).every(allNumbersFinite);
  return true;
}

describe("alignment calculator request", () => {
  test("contract: plan, design and error curve when a gang is given", () => {
    const r = runAlignmentTool(
      alignmentRequestSchema.parse({
        band: { lowKHz: 540, highKHz: 1600 },
        ifKHz: 455,
        gang: { minPF: 10, maxPF: 365 },
        trackingPointsKHz: [600, 1000, 1400],
      }),
    );
    expect(r.lo).toEqual({ lowKHz: 995, highKHz: 2055 });
    expect(r.image).toEqual({ lowKHz: 1450, highKHz: 2510 });
    expect(r.capacitanceRatio.signal).toBeCloseTo(8.779, 3);
    expect(r.trackingPointsKHz).toEqual([600, 1000, 1400]);
    expect(r.steps[0]).toMatchObject({ order: 1 });
    expect(r.design?.padderPF).toBeCloseTo(413.25, 2);
    expect(r.design?.maxAbsErrorKHz).toBeCloseTo(11.66, 2);
    expect(r.design?.errorCurve.length).toBeGreaterThan(100);
    // Loaded Q 80 assumed; the least-loss points lose about 2.25 dB (REFERENCES.md, sensitivity lost to tracking error).
    expect(r.design?.loadedQ).toBe(80);
    expect(r.design?.loadedQAssumed).toBe(true);
    expect(Math.abs((r.design?.minimax?.sensitivityLossDb ?? 0) - 2.25)).toBeLessThan(0.03);
    expect(r.design?.sensitivityLossDb).toBeGreaterThan(r.design?.minimax?.sensitivityLossDb ?? Infinity);
    expect(r.design?.comparisons.every((c) => !c.ok || c.sensitivityLossDb > 0)).toBe(true);
    expect(allNumbersFinite(r)).toBe(true);
  });

  test("no gang, no design", () => {
    const r = runAlignmentTool(alignmentRequestSchema.parse({ band: { lowKHz: 5900, highKHz: 18000 }, ifKHz: 455 }));
    expect(r.design).toBeUndefined();
    expect(r.bandKind).toBe("SW");
  });

  const fieldsOf = (raw: unknown) => {
    const r = alignmentRequestSchema.safeParse(raw);
    return r.success ? {} : fieldErrors(r.error);
  };

  test("bad input gives field-level messages", () => {
    expect(Object.keys(fieldsOf({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455, trackingPointsKHz: [600, 1000] }))).toEqual([
      "trackingPointsKHz.2",
    ]);
    expect(Object.keys(fieldsOf({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 4550 }))).toEqual(["ifKHz"]);
    expect(fieldsOf({ band: { lowKHz: 1600, highKHz: 540 }, ifKHz: 455, trackingPointsKHz: [600, 1000, 1700] })).toEqual({
      "band.highKHz": "The high end must be above the low end.",
    });
    expect(fieldsOf({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455, trackingPointsKHz: [600, 1000, 1700] })).toEqual({
      "trackingPointsKHz.2": "Tracking points must lie on the band.",
    });
    expect(alignmentRequestSchema.safeParse({ band: { lowKHz: Number.POSITIVE_INFINITY, highKHz: 1600 }, ifKHz: 455 }).success).toBe(false);
  });

  // Families of IF (REFERENCES.md, intermediate frequencies): 455-class for AM bands, 10.7 MHz for FM.
  test("band and IF of different families are refused on the IF field; the kind comes from the band", () => {
    expect(fieldsOf({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 10700 })["ifKHz"]).toMatch(/MW band needs an AM IF/);
    expect(fieldsOf({ band: { lowKHz: 88000, highKHz: 108000 }, ifKHz: 455 })["ifKHz"]).toMatch(/FM band needs an FM IF/);
    expect(fieldsOf({ band: { lowKHz: 88000, highKHz: 108000, kind: "MW" }, ifKHz: 455 })["band.kind"]).toMatch(/MW dial lies between/);
    expect(runAlignmentTool(parseAlignmentRequest({ band: { lowKHz: 1600, highKHz: 4500 }, ifKHz: 455 })).bandKind).toBe("SW");
    expect(runAlignmentTool(parseAlignmentRequest({ band: { lowKHz: 88000, highKHz: 108000 }, ifKHz: 10700 })).bandKind).toBe("FM");
  });

  test("frequency fields take a unit, and refuse what is not a frequency by name", () => {
    const r = parseAlignmentRequest({
      band: { lowKHz: "0.54 MHz", highKHz: "1600k" },
      ifKHz: "455 kHz",
      trackingPointsKHz: ["600", 1000, "1.4M"],
    });
    expect(r.basis.band).toMatchObject({ lowKHz: 540, highKHz: 1600, kind: "MW" });
    expect(r.basis.ifKHz).toBe(455);
    expect(r.trackingPointsKHz).toEqual([600, 1000, 1400]);
    expect(fieldsOf({ band: { lowKHz: -540, highKHz: 1600 }, ifKHz: 455 })["band.lowKHz"]).toMatch(/above zero/);
    expect(fieldsOf({ band: { lowKHz: 0.58, highKHz: 1600 }, ifKHz: 455 })["band.lowKHz"]).toMatch(/0\.58 MHz/);
    expect(fieldsOf({ band: { lowKHz: "five", highKHz: 1600 }, ifKHz: 455 })["band.lowKHz"]).toMatch(/with its unit/);
  });

  // Common practice: an AC/DC set's chassis is tied to the mains; work on it through an isolation transformer.
  test("a hot-chassis request opens the plan with the isolation-transformer caution", () => {
    const r = runAlignmentTool(parseAlignmentRequest({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455, hotChassis: true }));
    expect(r.steps[0]?.text).toMatch(/isolation transformer/);
    const plain = runAlignmentTool(parseAlignmentRequest({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455 }));
    expect(plain.steps.some((s) => /isolation transformer/.test(s.text))).toBe(false);
  });

  // REFERENCES.md (tracking): a series padder cannot widen the oscillator's capacitance ratio, which a low LO needs.
  test("low-side injection with a gang keeps the plan and designs what can be designed, saying why", () => {
    const mw = runAlignmentTool(
      parseAlignmentRequest({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455, injection: "low", gang: { minPF: 10, maxPF: 365 } }),
    );
    expect(mw.lo).toEqual({ lowKHz: 85, highKHz: 1145 });
    expect(mw.steps.length).toBeGreaterThan(3);
    expect(mw.design?.method).toBe("signal-only");
    expect(mw.design?.signalInductanceUH).toBeCloseTo(216.82, 2);
    expect(mw.design?.padderPF).toBeNull();
    expect(mw.design?.notes.join(" ")).toMatch(/padder/);
    const sw = runAlignmentTool(
      parseAlignmentRequest({ band: { lowKHz: 5900, highKHz: 18000 }, ifKHz: 455, injection: "low", gang: { minPF: 12, maxPF: 365 } }),
    );
    expect(sw.design?.method).toBe("trimmer-only");
    expect(sw.design?.padderPF).toBeNull();
    expect(sw.design?.oscillatorInductanceUH).toBeGreaterThan(0);
    expect(sw.design?.notes.length).toBeGreaterThan(0);
  });

  // Common practice: FM front ends track with the oscillator coil and trimmer; they use no padder.
  test("FM designs have no padder and track at two points", () => {
    const r = runAlignmentTool(
      parseAlignmentRequest({ band: { lowKHz: 88000, highKHz: 108000 }, ifKHz: 10700, gang: { minPF: 5, maxPF: 20 } }),
    );
    expect(r.design?.method).toBe("trimmer-only");
    expect(r.design?.padderPF).toBeNull();
    expect(r.design?.minimax).toBeNull();
    expect(r.design?.loadedQ).toBe(25);
    expect(r.design?.notes.join(" ")).toMatch(/no padder/);
  });

  test("the engine's refusal becomes the same 400 body", () => {
    let body: ReturnType<typeof invalidInputBody> = null;
    try {
      runAlignmentTool(parseAlignmentRequest({ band: { lowKHz: 150, highKHz: 1600 }, ifKHz: 455, gang: { minPF: 10, maxPF: 365 } }));
    } catch (e) {
      body = invalidInputBody(e);
    }
    expect(body?.error.code).toBe("invalid_input");
    expect(Object.keys(body?.error.fields ?? {})).toEqual(["gang.maxPF"]);
    expect(invalidInputBody(new TypeError("boom"))).toBeNull();
  });

  test("property: any request the schema accepts gives a finite response or the engine's error", () => {
    const num = fc.oneof(fc.double({ min: 0, max: 200_000, noNaN: true }), fc.constantFrom(455, 10700, 540, 1600, 88000, 108000, 10, 365));
    fc.assert(
      fc.property(
        fc.record({
          band: fc.record({ lowKHz: num, highKHz: num }),
          ifKHz: num,
          injection: fc.option(fc.constantFrom("high", "low"), { nil: undefined }),
          gang: fc.option(
            fc.record({ minPF: fc.double({ min: 0, max: 50, noNaN: true }), maxPF: fc.double({ min: 0, max: 600, noNaN: true }) }),
            { nil: undefined },
          ),
        }),
        (raw) => {
          const parsed = alignmentRequestSchema.safeParse(raw);
          if (!parsed.success) return;
          try {
            expect(allNumbersFinite(runAlignmentTool(parsed.data))).toBe(true);
          } catch (e) {
            expect(e).toBeInstanceOf(EngineError);
          }
        },
      ),
      { numRuns: 60 },
    );
  });
});

describe("estimate request", () => {
  test("contract: lines and totals", () => {
    const r = runEstimateTool(estimateRequestSchema.parse({ profile: aurelianTableSet }), defaultShopPolicy, defaultPartsCatalogue);
    expect(r.lines[0]).toEqual(
      expect.objectContaining({
        code: "inspect.intake",
        title: expect.any(String),
        category: "inspection",
        minutes: 20,
        quantity: 1,
        reason: expect.any(String),
        readings: [],
      }),
    );
    expect(Object.keys(r.totals)).toEqual(
      expect.arrayContaining(["currency", "labourMinor", "partsMinor", "taxMinor", "totalMinor", "depositMinor", "balanceMinor"]),
    );
    expect(r.totals.currency).toBe("USD");
    expect(r.totals.depositMinor + r.totals.balanceMinor).toBe(r.totals.totalMinor);
  });

  test("bad profiles give field paths under profile", () => {
    const r = estimateRequestSchema.safeParse({ profile: { kind: "valve", bands: [], electrolytics: -1, paperCapacitors: 2 } });
    expect(r.success).toBe(false);
    const fields = r.success ? {} : fieldErrors(r.error);
    expect(Object.keys(fields)).toEqual(expect.arrayContaining(["profile.kind", "profile.bands", "profile.electrolytics"]));
  });

  test("property: any profile the schema accepts prices without throwing", () => {
    const band = fc.oneof(
      fc.record({
        kind: fc.constant("MW"),
        lowKHz: fc.integer({ min: 400, max: 900 }),
        highKHz: fc.integer({ min: 1000, max: 1800 }),
        ifKHz: fc.integer({ min: 100, max: 600 }),
      }),
      fc.record({
        kind: fc.constant("SW"),
        lowKHz: fc.integer({ min: 1500, max: 9000 }),
        highKHz: fc.integer({ min: 9001, max: 30000 }),
        ifKHz: fc.integer({ min: 100, max: 600 }),
      }),
      fc.record({
        kind: fc.constant("LW"),
        lowKHz: fc.integer({ min: 100, max: 200 }),
        highKHz: fc.integer({ min: 201, max: 520 }),
        ifKHz: fc.integer({ min: 100, max: 600 }),
      }),
      fc.record({
        kind: fc.constant("FM"),
        lowKHz: fc.integer({ min: 64000, max: 90000 }),
        highKHz: fc.integer({ min: 90001, max: 110000 }),
        ifKHz: fc.integer({ min: 10600, max: 10800 }),
      }),
    );
    fc.assert(
      fc.property(
        fc.record({
          kind: fc.constantFrom("tube-acdc", "tube-transformer", "transistor-battery", "transistor-mains"),
          bands: fc.array(band, { minLength: 1, maxLength: 8 }),
          electrolytics: fc.integer({ min: 0, max: 60 }),
          paperCapacitors: fc.integer({ min: 0, max: 120 }),
          tubes: fc.option(fc.integer({ min: 0, max: 40 }), { nil: undefined }),
          transistors: fc.option(fc.integer({ min: 0, max: 60 }), { nil: undefined }),
          ifTransformers: fc.option(fc.integer({ min: 0, max: 12 }), { nil: undefined }),
          seleniumRectifier: fc.option(fc.boolean(), { nil: undefined }),
          lineCordWorn: fc.option(fc.boolean(), { nil: undefined }),
          dialCordBroken: fc.option(fc.boolean(), { nil: undefined }),
          batteryCorrosion: fc.option(fc.boolean(), { nil: undefined }),
          mainsVolts: fc.option(fc.constantFrom(120, 230), { nil: undefined }),
        }),
        (profile) => {
          const parsed = estimateRequestSchema.safeParse({ profile });
          expect(parsed.success).toBe(true);
          if (!parsed.success) return;
          try {
            const r = runEstimateTool(parsed.data, defaultShopPolicy, defaultPartsCatalogue);
            expect(allNumbersFinite(r)).toBe(true);
            expect(r.totals.depositMinor + r.totals.balanceMinor).toBe(r.totals.totalMinor);
          } catch (e) {
            expect(e).toBeInstanceOf(EngineError);
          }
        },
      ),
      { numRuns: 200 },
    );
  });
});
