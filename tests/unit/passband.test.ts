import fc from "fast-check";
import { evaluate } from "mathjs";
import { describe, expect, test } from "vitest";
import { analyseDiscriminator, analysePassband, type PassbandPoint } from "@/lib/engine/passband";

// The outside reference: the textbook responses of tuned circuits near resonance (narrow-band form, from
// memory of any radio-engineering text, e.g. Terman's handbook), evaluated by mathjs from the formula text,
// not by the code under test. x = 2·Q·Δf / f0 is the fractional detuning.
//   single tuned:                       |H| = 1 / sqrt(1 + x²)           → −3 dB bandwidth f0 / Q
//   double tuned, critical (k·Q = 1):   |H| = 2 / sqrt(4 + x⁴)           → −3 dB bandwidth √2 · f0 / Q
const SINGLE = "20 * log10(1 / sqrt(1 + (2 * Q * df / f0)^2))";
const DOUBLE_CRITICAL = "20 * log10(2 * k * Q / sqrt((1 + (k * Q)^2 - (2 * Q * df / f0)^2)^2 + 4 * (2 * Q * df / f0)^2))";

function sweep(formula: string, scope: Record<string, number>, spanKHz: number, stepKHz: number): PassbandPoint[] {
  const out: PassbandPoint[] = [];
  for (let df = -spanKHz; df <= spanKHz + 1e-9; df += stepKHz) {
    out.push({ offsetKHz: Number(df.toFixed(6)), db: evaluate(formula, { ...scope, df }) as number });
  }
  return out;
}

describe("IF passband against the textbook tuned-circuit responses", () => {
  test("single tuned, f0 = 455 kHz, Q = 50: −3 dB bandwidth f0/Q = 9.1 kHz; −6 dB √3·f0/Q = 15.76 kHz (textbook)", () => {
    const r = analysePassband(sweep(SINGLE, { f0: 455, Q: 50 }, 20, 0.5));
    expect(r.db3.widthKHz!).toBeCloseTo(455 / 50, 1);
    expect(r.db6.widthKHz!).toBeCloseTo((Math.sqrt(3) * 455) / 50, 1);
    expect(r.peakOffsetKHz).toBeCloseTo(0, 6);
    expect(r.db3.symmetryKHz!).toBeCloseTo(0, 6);
    expect(r.notes).toEqual([]);
  });

  test("double tuned, critically coupled (kQ = 1), f0 = 455 kHz, Q = 60: −3 dB bandwidth √2·f0/Q = 10.72 kHz (textbook)", () => {
    const r = analysePassband(sweep(DOUBLE_CRITICAL, { f0: 455, Q: 60, k: 1 / 60 }, 20, 0.5));
    expect(r.db3.widthKHz!).toBeCloseTo((Math.SQRT2 * 455) / 60, 1);
    // The flat top: 2/sqrt(4 + x⁴) is 0 dB at x = 0 and has no other maximum.
    expect(r.peakDb).toBeCloseTo(0, 6);
  });

  test("an FM strip, f0 = 10.7 MHz, Q = 50, single tuned: 214 kHz wide at −3 dB (textbook f0/Q)", () => {
    const r = analysePassband(sweep(SINGLE, { f0: 10700, Q: 50 }, 500, 10));
    expect(r.db3.widthKHz!).toBeGreaterThan(212);
    expect(r.db3.widthKHz!).toBeLessThan(216);
  });

  test("a response pulled 2 kHz high: the peak and the centre move with it, widths unchanged (textbook curve shifted)", () => {
    const points = sweep(SINGLE.replaceAll("df", "(df - 2)"), { f0: 455, Q: 50 }, 20, 0.5);
    const r = analysePassband(points);
    expect(r.peakOffsetKHz).toBeCloseTo(2, 3);
    expect(r.centreKHz!).toBeCloseTo(2, 2);
    expect(r.db3.widthKHz!).toBeCloseTo(9.1, 1);
  });

  test("a lopsided response shows as symmetry (worked by hand: lower edge −26/11, upper 46/11, symmetry 20/11 kHz)", () => {
    // A rounded top (−0.5 dB at ±1 kHz, so the parabola peaks at 0 kHz, 0 dB) and straight skirts to −6 dB at
    // −4 and +8 kHz. −3 dB low: −4 + 3·3/5.5 = −26/11; high: 1 + 2.5·7/5.5 = 46/11.
    const r = analysePassband([
      { offsetKHz: -4, db: -6 },
      { offsetKHz: -1, db: -0.5 },
      { offsetKHz: 0, db: 0 },
      { offsetKHz: 1, db: -0.5 },
      { offsetKHz: 8, db: -6 },
    ]);
    expect(r.peakOffsetKHz).toBeCloseTo(0, 12);
    expect(r.db3.lowerKHz).toBeCloseTo(-26 / 11, 9);
    expect(r.db3.upperKHz).toBeCloseTo(46 / 11, 9);
    expect(r.db3.symmetryKHz).toBeCloseTo(20 / 11, 9);
    expect(r.centreKHz).toBeCloseTo(10 / 11, 9);
    expect(r.db6.widthKHz).toBeCloseTo(12, 9);
  });

  test("widths do not depend on the reference level: adding a constant dB changes nothing (property, fast-check)", () => {
    const base = sweep(SINGLE, { f0: 455, Q: 40 }, 25, 1);
    const ref = analysePassband(base);
    fc.assert(
      fc.property(fc.double({ min: -60, max: 60, noNaN: true }), (offset) => {
        const r = analysePassband(base.map((p) => ({ ...p, db: p.db + offset })));
        expect(r.db3.widthKHz!).toBeCloseTo(ref.db3.widthKHz!, 9);
        expect(r.db6.widthKHz!).toBeCloseTo(ref.db6.widthKHz!, 9);
        expect(r.db3.symmetryKHz!).toBeCloseTo(ref.db3.symmetryKHz!, 9);
      }),
    );
  });

  test("mirroring the sweep about the IF mirrors the symmetry (property, fast-check)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -40, max: -0.5, noNaN: true }), { minLength: 6, maxLength: 6 }),
        fc.array(fc.double({ min: -40, max: -0.5, noNaN: true }), { minLength: 6, maxLength: 6 }),
        (lowSide, highSide) => {
          const pts: PassbandPoint[] = [
            ...lowSide.sort((a, b) => a - b).map((db, i) => ({ offsetKHz: -12 + 2 * i, db })),
            { offsetKHz: 0, db: 0 },
            ...highSide.sort((a, b) => b - a).map((db, i) => ({ offsetKHz: 2 + 2 * i, db })),
          ];
          const a = analysePassband(pts);
          const b = analysePassband(pts.map((p) => ({ ...p, offsetKHz: -p.offsetKHz })));
          if (a.db3.widthKHz === null) {
            expect(b.db3.widthKHz).toBeNull();
          } else {
            expect(b.db3.widthKHz!).toBeCloseTo(a.db3.widthKHz, 9);
            expect(b.db3.symmetryKHz!).toBeCloseTo(-a.db3.symmetryKHz!, 9);
          }
        },
      ),
    );
  });

  test("a sweep that never falls 6 dB says so instead of inventing a width", () => {
    // Symmetric top (peak 0 dB at 0 kHz); the low side stops at −2 dB; high side −6 dB at 2 + 2·5/6 kHz.
    const r = analysePassband([
      { offsetKHz: -4, db: -2 },
      { offsetKHz: -2, db: -1 },
      { offsetKHz: 0, db: 0 },
      { offsetKHz: 2, db: -1 },
      { offsetKHz: 4, db: -7 },
    ]);
    expect(r.db3.widthKHz).toBeNull();
    expect(r.db6.upperKHz).toBeCloseTo(2 + 10 / 6, 9);
    expect(r.notes.join(" ")).toMatch(/does not fall 3 dB below the peak on the low side/);
  });

  test("bad sweeps are refused with the field named", () => {
    expect(() => analysePassband([{ offsetKHz: 0, db: 0 }])).toThrow(/at least 3 points/);
    expect(() =>
      analysePassband([
        { offsetKHz: 0, db: 0 },
        { offsetKHz: 0, db: -1 },
        { offsetKHz: 1, db: -3 },
      ]),
    ).toThrow(/Two points at 0 kHz/);
  });
});

describe("FM discriminator S-curve", () => {
  // A cubic S-curve v = a·u − b·u³ with u = Δf − x0 (worked by hand): zero at x0, slope a at the centre,
  // slope a − 3b·u², which stays within p % of a while |u| ≤ sqrt(p·a / (300·b)).
  const curve = (x0: number, a: number, b: number) =>
    Array.from({ length: 81 }, (_, i) => {
      const df = -200 + 5 * i;
      return { offsetKHz: df, volts: evaluate("a*(df - x0) - b*(df - x0)^3", { a, b, df, x0 }) as number };
    });

  test("zero crossing 7.5 kHz high is found by interpolation (worked by hand)", () => {
    const r = analyseDiscriminator(curve(7.5, 0.02, 2e-7));
    expect(r.zeroCrossingKHz).toBeCloseTo(7.5, 1);
    expect(r.centreSlopeVPerKHz).toBeCloseTo(0.02, 3);
  });

  test("linear range within 10 %: about ±57.7 kHz for a = 0.02 V/kHz, b = 2e-7 (worked by hand)", () => {
    const r = analyseDiscriminator(curve(0, 0.02, 2e-7), 10);
    const half = Math.sqrt((10 * 0.02) / (300 * 2e-7));
    expect(half).toBeCloseTo(57.7, 1);
    // Segments are 5 kHz long: the edges land within one segment of the exact half-width.
    expect(r.linearHighKHz).toBeGreaterThan(half - 5);
    expect(r.linearHighKHz).toBeLessThan(half + 5);
    expect(r.linearLowKHz).toBeLessThan(-half + 5);
    expect(r.linearLowKHz).toBeGreaterThan(-half - 5);
  });

  test("a curve that never crosses zero is refused", () => {
    expect(() =>
      analyseDiscriminator([
        { offsetKHz: -10, volts: 1 },
        { offsetKHz: 0, volts: 2 },
        { offsetKHz: 10, volts: 3 },
      ]),
    ).toThrow(/never crosses zero/);
  });
});
