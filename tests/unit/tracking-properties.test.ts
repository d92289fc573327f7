import fc from "fast-check";
import { describe, expect, test } from "vitest";
import {
  checkTrackingBasis,
  checkTrackingPoints,
  designThreePoint,
  gangSettingPF,
  oscillatorKHzAt,
  sampleErrorCurve,
  solveTracking,
  trackingErrorKHz,
} from "@/lib/engine/alignment";
import { EngineError } from "@/lib/engine/engine-error";

/** Realistic MW sets: the shapes of gang, band and points a bench actually meets. */
const mwDesign = fc
  .record({
    low: fc.double({ min: 500, max: 600, noNaN: true }),
    high: fc.double({ min: 1500, max: 1720, noNaN: true }),
    ifKHz: fc.double({ min: 440, max: 475, noNaN: true }),
    minPF: fc.double({ min: 6, max: 18, noNaN: true }),
    maxPF: fc.double({ min: 320, max: 500, noNaN: true }),
    a: fc.double({ min: 0.03, max: 0.12, noNaN: true }),
    b: fc.double({ min: 0.4, max: 0.6, noNaN: true }),
    c: fc.double({ min: 0.85, max: 0.97, noNaN: true }),
  })
  .map((r) => {
    const at = (t: number) => Math.exp(Math.log(r.low) + t * (Math.log(r.high) - Math.log(r.low)));
    return {
      ...checkTrackingBasis({ band: { lowKHz: r.low, highKHz: r.high }, ifKHz: r.ifKHz, gang: { minPF: r.minPF, maxPF: r.maxPF } }),
      trackingPointsKHz: [at(r.a), at(r.b), at(r.c)],
    };
  });

describe("tracking properties", () => {
  test("LO − RF = IF exactly (to 1 µHz) at each tracking point", () => {
    fc.assert(
      fc.property(mwDesign, (input) => {
        const d = designThreePoint(input);
        for (const f of d.trackingPointsKHz) {
          const lo = oscillatorKHzAt(d.oscillator, gangSettingPF(d.signal, f));
          expect(Math.abs(lo - f - input.ifKHz)).toBeLessThan(1e-6);
        }
      }),
    );
  });

  test("the error curve is zero at the points and continuous across the band", () => {
    fc.assert(
      fc.property(mwDesign, fc.double({ min: 0, max: 1, noNaN: true }), (input, t) => {
        const d = designThreePoint(input);
        const curve = sampleErrorCurve(d, 101);
        for (const p of d.trackingPointsKHz) {
          const sample = curve.find((q) => q.kHz === p);
          expect(sample).toBeDefined();
          expect(Math.abs(sample?.errorKHz ?? Number.NaN)).toBeLessThan(1e-6);
        }
        // Lipschitz check: a small step in frequency moves the error by at most a few times the step.
        const f = input.band.lowKHz + t * (input.band.highKHz - input.band.lowKHz - 0.01);
        const h = 1e-3;
        expect(Math.abs(trackingErrorKHz(d, f + h) - trackingErrorKHz(d, f))).toBeLessThan(5 * h);
        // Neighbouring samples differ by far less than the span of the error itself.
        for (let i = 1; i < curve.length; i++) {
          expect(Math.abs(curve[i].errorKHz - curve[i - 1].errorKHz)).toBeLessThan(5 * (curve[i].kHz - curve[i - 1].kHz));
        }
      }),
    );
  });

  test("no input, however absurd, gives anything but the engine's error or a finite design", () => {
    const anyNumber = fc.oneof(fc.double(), fc.constantFrom(0, -1, Number.NaN, Number.POSITIVE_INFINITY, 455, 10700, 540, 1600));
    fc.assert(
      fc.property(
        fc.record({
          low: anyNumber,
          high: anyNumber,
          ifKHz: anyNumber,
          minPF: anyNumber,
          maxPF: anyNumber,
          strayPF: fc.option(anyNumber, { nil: undefined }),
          injection: fc.constantFrom("high" as const, "low" as const),
          points: fc.option(fc.tuple(anyNumber, anyNumber, anyNumber), { nil: undefined }),
        }),
        (r) => {
          try {
            // Through the door first, as every caller does; then the design on what passed.
            const basis = checkTrackingBasis({
              band: { lowKHz: r.low, highKHz: r.high },
              ifKHz: r.ifKHz,
              injection: r.injection,
              gang: { minPF: r.minPF, maxPF: r.maxPF, strayPF: r.strayPF },
            });
            const points = r.points ? checkTrackingPoints(r.points, basis.band) : undefined;
            const s = solveTracking({ ...basis, ...(points ? { trackingPointsKHz: points } : {}), samples: 11 });
            const numbers = [
              s.padderPF,
              s.oscillatorFixedPF,
              s.oscillatorInductanceUH,
              s.signalInductanceUH,
              s.maxAbsErrorKHz,
              ...s.errorCurve.map((p) => p.errorKHz),
            ];
            expect(numbers.every(Number.isFinite)).toBe(true);
          } catch (e) {
            expect(e).toBeInstanceOf(EngineError);
          }
        },
      ),
    );
  });
});
