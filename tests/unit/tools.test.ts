import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { EngineError } from "@/lib/engine/engine-error";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import {
  alignmentRequestSchema,
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
    expect(r.design?.minimax?.maxAbsErrorKHz).toBeCloseTo(4.68, 2);
    expect(allNumbersFinite(r)).toBe(true);
  });

  test("no gang, no design", () => {
    const r = runAlignmentTool(alignmentRequestSchema.parse({ band: { lowKHz: 5900, highKHz: 18000 }, ifKHz: 455 }));
    expect(r.design).toBeUndefined();
    expect(r.bandKind).toBe("SW");
  });

  test("bad input gives field-level messages", () => {
    const r = alignmentRequestSchema.safeParse({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 4550, trackingPointsKHz: [600, 1000] });
    expect(r.success).toBe(false);
    const fields = r.success ? {} : fieldErrors(r.error);
    expect(Object.keys(fields)).toEqual(expect.arrayContaining(["ifKHz", "trackingPointsKHz"]));
    const order = alignmentRequestSchema.safeParse({
      band: { lowKHz: 1600, highKHz: 540 },
      ifKHz: 455,
      trackingPointsKHz: [600, 1000, 1700],
    });
    expect(order.success ? {} : fieldErrors(order.error)).toEqual({
      "band.highKHz": "The high end must be above the low end.",
      "trackingPointsKHz.0": "Tracking points must lie on the band.",
      "trackingPointsKHz.1": "Tracking points must lie on the band.",
      "trackingPointsKHz.2": "Tracking points must lie on the band.",
    });
    expect(alignmentRequestSchema.safeParse({ band: { lowKHz: Number.POSITIVE_INFINITY, highKHz: 1600 }, ifKHz: 455 }).success).toBe(false);
  });

  test("the engine's refusal becomes the same 400 body", () => {
    let body: ReturnType<typeof invalidInputBody> = null;
    try {
      runAlignmentTool(alignmentRequestSchema.parse({ band: { lowKHz: 150, highKHz: 1600 }, ifKHz: 455, gang: { minPF: 10, maxPF: 365 } }));
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
    const r = runEstimateTool(estimateRequestSchema.parse({ profile: aurelianTableSet }), defaultShopPolicy);
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
            const r = runEstimateTool(parsed.data, defaultShopPolicy);
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
