import { describe, expect, test } from "vitest";
import { DEFAULT_GANG_BY_KIND, fitDial, type DialReading } from "@/lib/engine/alignment/dial-fit";
import { EngineError } from "@/lib/engine/engine-error";
import { dialFitRequestSchema, fieldErrors, runDialFitTool } from "@/lib/engine/requests";
import { defaultTolerances } from "@/lib/engine/verdicts";
import numeric from "numeric";
import { oracleThreePoint } from "./support/oracles";

/*
 * The oracle set: the three-point design solved by numeric (Newton on the raw tracking equations, see
 * support/oracles.ts), then mis-adjusted by hand. Its readings are computed here in SI units from
 * f = 1/(2π√(LC)) and the series padder, with none of the engine's formulas.
 */
const TWO_PI = 2 * Math.PI;
const fKHz = (uH: number, pF: number) => 1 / (TWO_PI * Math.sqrt(uH * 1e-6 * pF * 1e-12)) / 1e3;
const gangAt = (Ls: number, Ts: number, kHz: number) => 1 / ((TWO_PI * kHz * 1e3) ** 2 * Ls * 1e-6) / 1e-12 - Ts;
const seriesPF = (P: number | null, x: number) => (P === null ? x : (P * x) / (P + x));

type OracleSet = { Ls: number; Ts: number; P: number | null; To: number; Lo: number };
const loAt = (s: OracleSet, dialKHz: number) => fKHz(s.Lo, seriesPF(s.P, gangAt(s.Ls, s.Ts, dialKHz) + s.To));

function engineErrorOf(fn: () => unknown): EngineError {
  try {
    fn();
  } catch (e) {
    if (e instanceof EngineError) return e;
    throw e;
  }
  throw new Error("expected an EngineError");
}

const round = (x: number, step: number) => Math.round(x / step) * step;

describe("MW 540–1600 kHz, IF 455, gang 10–365 pF, points 600 / 1000 / 1400 (oracle: numeric Newton design, SI readings)", () => {
  const band = { lowKHz: 540, highKHz: 1600 };
  const gang = { minPF: 10, maxPF: 365 };
  const points: [number, number, number] = [600, 1000, 1400];
  const design = oracleThreePoint(band, 455, gang, points);
  const base = { band, ifKHz: 455, gang, trackingPointsKHz: points };
  const marks = [550, 600, 800, 1000, 1200, 1400, 1600];

  test("the oracle's design solves its own tracking equations", () => {
    expect(design.residual.every((r) => Math.abs(r) < 1e-6)).toBe(true);
  });

  test("received readings (to 0.1 kHz, a counter on the generator): coil +2.5 %, parallel −3.0 pF recovered within 0.1 % and 0.2 pF", () => {
    const set: OracleSet = { ...design, Lo: design.Lo * 1.025, To: design.To - 3 };
    const readings = marks.map((d) => ({ dialKHz: d, receivedKHz: round(loAt(set, d) - 455, 0.1) }));
    const r = fitDial({ ...base, readings });
    expect(Math.abs(r.fit.inductanceErrorPct - 2.5)).toBeLessThan(0.1);
    expect(Math.abs(r.fit.parallelErrorPF - -3)).toBeLessThan(0.2);
    // Rounding to 0.1 kHz leaves at most 0.05 kHz per reading.
    expect(r.fit.residualKHz).toBeLessThan(0.05);
    expect(r.design.inductanceUH).toBeCloseTo(design.Lo, 5);
    expect(r.design.parallelPF).toBeCloseTo(design.To, 5);
    expect(r.design.padderPF).toBeCloseTo(design.P, 5);
  });

  test("LO readings on a counter: coil −1.8 %, parallel +2.2 pF recovered within 0.1 % and 0.2 pF", () => {
    const set: OracleSet = { ...design, Lo: design.Lo * 0.982, To: design.To + 2.2 };
    const readings = [560, 700, 1000, 1300, 1550].map((d) => ({ dialKHz: d, loKHz: round(loAt(set, d), 0.1) }));
    const r = fitDial({ ...base, readings });
    expect(Math.abs(r.fit.inductanceErrorPct - -1.8)).toBeLessThan(0.1);
    expect(Math.abs(r.fit.parallelErrorPF - 2.2)).toBeLessThan(0.2);
  });

  test("received and LO readings mixed give the same fit: received = LO − IF on the high side (computed from the relation)", () => {
    const set: OracleSet = { ...design, Lo: design.Lo * 1.01, To: design.To + 1 };
    const readings: DialReading[] = marks.map((d, i) =>
      i % 2 ? { dialKHz: d, loKHz: loAt(set, d) } : { dialKHz: d, receivedKHz: loAt(set, d) - 455 },
    );
    const r = fitDial({ ...base, readings });
    expect(r.fit.inductanceErrorPct).toBeCloseTo(1, 6);
    expect(r.fit.parallelErrorPF).toBeCloseTo(1, 5);
    for (const b of r.before) expect(b.receivedKHz).toBeCloseTo(loAt(set, b.dialKHz) - 455, 6);
  });

  test("two readings at different marks fix both unknowns exactly", () => {
    const set: OracleSet = { ...design, Lo: design.Lo * 1.04, To: design.To - 5 };
    const r = fitDial({ ...base, readings: [600, 1400].map((d) => ({ dialKHz: d, receivedKHz: loAt(set, d) - 455 })) });
    expect(r.fit.inductanceErrorPct).toBeCloseTo(4, 6);
    expect(r.fit.parallelErrorPF).toBeCloseTo(-5, 5);
    expect(r.fit.residualKHz).toBeLessThan(1e-6);
  });

  test("noisy readings: the fit is the least-squares minimum that numeric's uncmin finds on the raw sum of squares", () => {
    const set: OracleSet = { ...design, Lo: design.Lo * 1.02, To: design.To - 2 };
    // Fixed reading errors of up to ±1.5 kHz, as a dial read by eye gives.
    const noise = [1.2, -0.8, 1.5, -1.1, 0.4, -1.5, 0.9];
    const readings = marks.map((d, i) => ({ dialKHz: d, receivedKHz: loAt(set, d) - 455 + noise[i] }));
    const r = fitDial({ ...base, readings });
    const ss = ([lPct, dT]: number[]) =>
      readings.reduce((s, x) => {
        const lo = loAt({ ...design, Lo: design.Lo * (1 + lPct / 100), To: design.To + dT }, x.dialKHz);
        return s + (lo - 455 - x.receivedKHz) ** 2;
      }, 0);
    // fmin's Nelder–Mead stops in a strict-mode slip on its shrink step under ESM; numeric's quasi-Newton
    // minimiser does the job.
    const uncmin = (
      numeric as unknown as { uncmin: (f: (x: number[]) => number, x0: number[], tol?: number) => { solution: number[]; f: number } }
    ).uncmin;
    const best = uncmin(ss, [0, 0], 1e-12);
    expect(r.fit.inductanceErrorPct).toBeCloseTo(best.solution[0], 3);
    expect(r.fit.parallelErrorPF).toBeCloseTo(best.solution[1], 3);
    expect(r.fit.residualKHz).toBeCloseTo(Math.sqrt(best.f / readings.length), 4);
  });

  test("advice with the coil: the coil's inductance down and the trimmer up by the mis-adjustment; after = the design's own tracking error", () => {
    const set: OracleSet = { ...design, Lo: design.Lo * 1.03, To: design.To - 4 };
    const r = fitDial({ ...base, readings: marks.map((d) => ({ dialKHz: d, receivedKHz: loAt(set, d) - 455 })) });
    expect(r.steps.map((s) => [s.order, s.adjust, s.direction, s.unit])).toEqual([
      [1, "coil", "decrease", "µH"],
      [2, "trimmer", "increase", "pF"],
    ]);
    expect(r.steps[0].amount).toBeCloseTo(set.Lo - design.Lo, 4);
    expect(r.steps[1].amount).toBeCloseTo(4, 4);
    expect(r.steps[0].text).toMatch(/slug further out/);
    for (const a of r.after) expect(a.errorKHz).toBeCloseTo(design.errorAt(a.dialKHz), 5);
    // The design tracks at its points.
    expect(r.after.find((a) => a.dialKHz === 600)?.errorKHz).toBeCloseTo(0, 6);
    expect(r.after.find((a) => a.dialKHz === 1400)?.errorKHz).toBeCloseTo(0, 6);
  });

  test("advice with the padder: the coil stays; the oracle's set with the advised padder and trimmer hits both tracking points", () => {
    const set: OracleSet = { ...design, Lo: design.Lo * 1.03, To: design.To - 4 };
    const r = fitDial({ ...base, lowEndAdjuster: "padder", readings: marks.map((d) => ({ dialKHz: d, loKHz: loAt(set, d) })) });
    expect(r.steps.map((s) => s.adjust)).toEqual(["padder", "trimmer"]);
    const padder = r.steps[0];
    const trimmer = r.steps[1];
    const newP = (design.P as number) + (padder.direction === "increase" ? 1 : -1) * padder.amount;
    const newTo = set.To + (trimmer.direction === "increase" ? 1 : -1) * trimmer.amount;
    const adjusted: OracleSet = { ...set, P: newP, To: newTo };
    expect(loAt(adjusted, 600)).toBeCloseTo(600 + 455, 4);
    expect(loAt(adjusted, 1400)).toBeCloseTo(1400 + 455, 4);
    // A larger coil needs less capacitance at the low end (f ∝ 1/√(LC)): the padder goes down.
    expect(padder.direction).toBe("decrease");
    for (const a of r.after) expect(a.receivedKHz).toBeCloseTo(loAt(adjusted, a.dialKHz) - 455, 4);
  });

  test("verdicts against max(10 kHz, 1 % of the mark) (REFERENCES: MW dial point, common practice)", () => {
    const set: OracleSet = { ...design, Lo: design.Lo * 1.03, To: design.To - 4 };
    const r = fitDial({ ...base, readings: marks.map((d) => ({ dialKHz: d, receivedKHz: loAt(set, d) - 455 })) });
    for (const b of r.before) {
      const allowed = Math.max(10, b.dialKHz / 100);
      expect(b.verdict).toBe(Math.abs(loAt(set, b.dialKHz) - 455 - b.dialKHz) <= allowed ? "pass" : "fail");
    }
    expect(r.before.some((b) => b.verdict === "fail")).toBe(true);
    expect(r.inTolerance).toBe(false);
    // The design's worst error, −11.66 kHz at 1600 (REFERENCES: typical MW design), is inside 16 kHz.
    expect(r.after.every((a) => a.verdict === "pass")).toBe(true);
  });

  test("a set at its design needs nothing turned (its error is the design's own)", () => {
    const r = fitDial({ ...base, readings: marks.map((d) => ({ dialKHz: d, receivedKHz: loAt(design, d) - 455 })) });
    expect(r.steps).toEqual([]);
    expect(r.inTolerance).toBe(true);
    expect(r.summary).toMatch(/nothing to turn/);
  });
});

describe("without a gang, the band kind's usual gang is assumed and named (common practice: 10–365 pF broadcast gang)", () => {
  test("MW: gang 10–365 pF, source default; the fit recovers the mis-adjustment of the oracle's design on that gang", () => {
    const band = { lowKHz: 530, highKHz: 1620 };
    const points: [number, number, number] = [600, 1000, 1400];
    const d = oracleThreePoint(band, 455, DEFAULT_GANG_BY_KIND.MW, points);
    const set: OracleSet = { ...d, Lo: d.Lo * 0.97, To: d.To + 3.5 };
    const r = fitDial({
      band,
      ifKHz: 455,
      trackingPointsKHz: points,
      readings: [560, 800, 1100, 1500].map((f) => ({ dialKHz: f, loKHz: loAt(set, f) })),
    });
    expect(r.gang).toEqual({ minPF: 10, maxPF: 365, strayPF: 0, source: "default" });
    expect(Math.abs(r.fit.inductanceErrorPct - -3)).toBeLessThan(0.1);
    expect(Math.abs(r.fit.parallelErrorPF - 3.5)).toBeLessThan(0.2);
  });

  test("SW 5.9–18 MHz, LO readings: coil +1.2 %, parallel −1.5 pF recovered", () => {
    const band = { lowKHz: 5900, highKHz: 18000 };
    const points: [number, number, number] = [6500, 10000, 16000];
    const d = oracleThreePoint(band, 455, DEFAULT_GANG_BY_KIND.SW, points, [3000, 40, 2]);
    expect(d.residual.every((x) => Math.abs(x) < 1e-6)).toBe(true);
    const set: OracleSet = { ...d, Lo: d.Lo * 1.012, To: d.To - 1.5 };
    const r = fitDial({
      band,
      ifKHz: 455,
      trackingPointsKHz: points,
      readings: [6000, 9000, 12000, 17500].map((f) => ({ dialKHz: f, loKHz: round(loAt(set, f), 1) })),
    });
    expect(r.bandKind).toBe("SW");
    expect(r.gang.source).toBe("default");
    expect(Math.abs(r.fit.inductanceErrorPct - 1.2)).toBeLessThan(0.1);
    expect(Math.abs(r.fit.parallelErrorPF - -1.5)).toBeLessThan(0.2);
  });
});

describe("FM 88–108 MHz, IF 10.7 MHz, default 3–20 pF section", () => {
  test("a dial reading 0.5 % high asks for a small change of a small coil, in words a technician can act on (from memory: FM oscillator coils are a few tenths of a µH, set by squeezing or spreading the turns)", () => {
    const r = fitDial({
      band: { lowKHz: 88000, highKHz: 108000 },
      ifKHz: 10700,
      readings: [89000, 98000, 107000].map((d) => ({ dialKHz: d, receivedKHz: d * 1.005 })),
    });
    expect(r.gang).toMatchObject({ minPF: 3, maxPF: 20, source: "default" });
    expect(r.design.inductanceUH).toBeGreaterThan(0.05);
    expect(r.design.inductanceUH).toBeLessThan(1);
    const coil = r.steps.find((s) => s.adjust === "coil");
    expect(coil?.direction).toBe("increase");
    expect(coil?.text).toMatch(/squeeze the oscillator coil's turns/);
    expect(coil?.text).not.toMatch(/about 0 µH/);
  });
});

describe("readings the fit refuses, each naming its field", () => {
  const base = { band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455, gang: { minPF: 10, maxPF: 365 } };

  test("fewer than two readings, or all at one place on the dial", () => {
    expect(engineErrorOf(() => fitDial({ ...base, readings: [{ dialKHz: 600, receivedKHz: 590 }] })).field).toBe("readings");
    const close = engineErrorOf(() =>
      fitDial({
        ...base,
        readings: [
          { dialKHz: 600, receivedKHz: 590 },
          { dialKHz: 610, receivedKHz: 600 },
        ],
      }),
    );
    expect(close.field).toBe("readings");
  });

  test("a mark outside the band", () => {
    const e = engineErrorOf(() =>
      fitDial({
        ...base,
        readings: [
          { dialKHz: 600, receivedKHz: 590 },
          { dialKHz: 1700, receivedKHz: 1690 },
        ],
      }),
    );
    expect(e.field).toBe("readings.1.dialKHz");
  });

  test("an LO below the IF with the oscillator above the signal, and a reading nowhere near its mark", () => {
    const lowLo = engineErrorOf(() =>
      fitDial({
        ...base,
        readings: [
          { dialKHz: 600, loKHz: 400 },
          { dialKHz: 1400, receivedKHz: 1400 },
        ],
      }),
    );
    expect(lowLo.field).toBe("readings.0.loKHz");
    // 900 kHz on the 1400 kHz mark: the LO would be 27 % off, more than a slug or trimmer moves it (from memory: a slug swings the inductance by about ±20 %, the frequency by half that).
    const far = engineErrorOf(() =>
      fitDial({
        ...base,
        readings: [
          { dialKHz: 600, receivedKHz: 600 },
          { dialKHz: 1400, receivedKHz: 900 },
        ],
      }),
    );
    expect(far.field).toBe("readings.1.receivedKHz");
  });

  test("readings no single oscillator setting explains: residual far above the 2 kHz reading resolution", () => {
    // A dial that reads 20 kHz high in the middle and true at both ends is a slipped pointer, not a slug.
    const e = engineErrorOf(() =>
      fitDial({
        ...base,
        trackingPointsKHz: [600, 1000, 1400],
        readings: [
          { dialKHz: 600, receivedKHz: 600 },
          { dialKHz: 1000, receivedKHz: 1040 },
          { dialKHz: 1400, receivedKHz: 1400 },
          { dialKHz: 800, receivedKHz: 760 },
        ],
      }),
    );
    expect(e.field).toBe("readings");
    expect(e.message).toMatch(/residual/);
  });

  test("the request schema: one of received or LO per reading, marks on the band, two different marks", () => {
    const parsed = dialFitRequestSchema.safeParse({
      ...base,
      readings: [{ dialKHz: 600, receivedKHz: 590, loKHz: 1045 }, { dialKHz: 2000, receivedKHz: 1990 }, { dialKHz: 600 }],
    });
    expect(parsed.success).toBe(false);
    const fields = parsed.success ? {} : fieldErrors(parsed.error);
    expect(Object.keys(fields).sort()).toEqual(["readings.0.loKHz", "readings.1.dialKHz", "readings.2.receivedKHz"]);
    const same = dialFitRequestSchema.safeParse({
      ...base,
      readings: [
        { dialKHz: 600, receivedKHz: 590 },
        { dialKHz: 600, receivedKHz: 591 },
      ],
    });
    expect(same.success ? {} : fieldErrors(same.error)).toEqual({ readings: "Give readings at two or more different dial marks." });
  });

  test("the tool judges with the shop's window for the band kind: SW within 2 % (REFERENCES: SW dial point, common practice)", () => {
    const req = dialFitRequestSchema.parse({
      band: { lowKHz: 5900, highKHz: 18000 },
      ifKHz: 455,
      readings: [
        { dialKHz: 6000, receivedKHz: 6100 },
        { dialKHz: 17000, receivedKHz: 17200 },
      ],
    });
    const r = runDialFitTool(req, defaultTolerances);
    expect(r.toleranceText).toBe("within ±2 % of the mark");
    expect(r.before.map((b) => b.verdict)).toEqual(["pass", "pass"]);
    expect(r.before[0].allowedKHz).toBeCloseTo(120, 9);
  });
});
