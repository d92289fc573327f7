import type { BandKind } from "../bands/band";
import { EngineError } from "../engine-error";
import type { WindowTolerance } from "../verdicts/tolerances";
import { RESONANCE_K } from "./frequencies";
import { checkTrackingBasis, type DialRange, type Gang, type Injection } from "./inputs";
import { solveTracking, type TrackingSolution } from "./solve-tracking";
import { gangSettingPF, type ErrorPoint, type TrackingDesign } from "./tracking";
import { ruleOfThumbPoints } from "./tracking-points";

/*
 * Dial-calibration fit. The set is the three-point design of its band (the alignment calculator's design);
 * a dial mark is where that design's signal circuit tunes, i.e. a gang setting. The oscillator of the real
 * set has drifted: its inductance L and its parallel capacitance T (gang minimum, strays and trimmer) are
 * unknown, the padder is the design's. Readings of the received frequency (or of the LO on a counter) at
 * two or more marks fix L and T by least squares in kHz; the advice then restores the design.
 */

export type LowEndAdjuster = "coil" | "padder";
export type DialReading = { dialKHz: number; receivedKHz?: number; loKHz?: number };

export type DialFitInput = {
  band: DialRange & { kind?: BandKind };
  ifKHz: number;
  injection?: Injection;
  gang?: Gang;
  trackingPointsKHz?: readonly number[];
  lowEndAdjuster?: LowEndAdjuster;
  readings: readonly DialReading[];
  /** The dial window a mark must read within; the bench's tolerance for the band kind when omitted. */
  tolerance?: WindowTolerance;
  /** How finely the bench reads a frequency; the band kind's usual figure when omitted. */
  resolutionKHz?: number;
};

export type DialVerdict = "pass" | "fail";
export type FitStep = {
  order: number;
  adjust: "coil" | "padder" | "trimmer";
  direction: "increase" | "decrease";
  amount: number;
  unit: "µH" | "pF";
  /** The tracking point at which the part is set, and the LO that puts the signal on its mark there. */
  atDialKHz: number;
  targetLoKHz: number;
  text: string;
};

export type OscillatorParts = { inductanceUH: number; parallelPF: number; padderPF: number | null };

export type DialFitResult = {
  bandKind: BandKind;
  injection: Injection;
  gang: Required<Gang> & { source: "given" | "default" };
  trackingPointsKHz: [number, number, number];
  lowEndAdjuster: LowEndAdjuster;
  design: OscillatorParts;
  actual: OscillatorParts;
  adjusted: OscillatorParts;
  fit: { inductanceErrorPct: number; parallelErrorPF: number; residualKHz: number; iterations: number };
  resolutionKHz: number;
  tolerance: WindowTolerance;
  before: { dialKHz: number; receivedKHz: number; errorKHz: number; fittedErrorKHz: number; allowedKHz: number; verdict: DialVerdict }[];
  after: { dialKHz: number; receivedKHz: number; errorKHz: number; allowedKHz: number; verdict: DialVerdict }[];
  inTolerance: boolean;
  steps: FitStep[];
  summary: string;
  /** Dial error across the band: as fitted now, and as predicted once the steps are done. */
  curves: { before: ErrorPoint[]; after: ErrorPoint[] };
};

/**
 * The gang assumed when none is given (common practice): the 10–365 pF broadcast gang for MW and SW, the
 * larger 12–500 pF European gang for LW, and a 3–20 pF FM section.
 */
export const DEFAULT_GANG_BY_KIND: Record<BandKind, Required<Gang>> = {
  LW: { minPF: 12, maxPF: 500, strayPF: 0 },
  MW: { minPF: 10, maxPF: 365, strayPF: 0 },
  SW: { minPF: 10, maxPF: 365, strayPF: 0 },
  FM: { minPF: 3, maxPF: 20, strayPF: 0 },
};

/** How finely a dial is read against a generator (from memory: half a minor division of a typical scale). */
export const READING_RESOLUTION_KHZ: Record<BandKind, number> = { LW: 1, MW: 2, SW: 10, FM: 50 };

/** The default dial windows of the bench (the shop's tolerance settings start from these). */
export const DEFAULT_DIAL_TOLERANCE: Record<BandKind, WindowTolerance> = {
  LW: { absKHz: 5, percent: 1 },
  MW: { absKHz: 10, percent: 1 },
  SW: { absKHz: 0, percent: 2 },
  FM: { absKHz: 200, percent: 0.5 },
};

/** A fit whose RMS residual exceeds this many reading resolutions does not describe one oscillator setting. */
export const RESIDUAL_LIMIT_RESOLUTIONS = 3;
/** Beyond these the readings are of something other than a drifted slug or trimmer. */
const MAX_LO_DEVIATION = 0.2;
const MAX_INDUCTANCE_CHANGE = 0.5;

const w = (kHz: number) => (kHz / RESONANCE_K) ** 2;

/** LO of an oscillator with parallel capacitance T (plus the gang setting g) in series with a padder. */
function oscillatorKHz(parts: OscillatorParts, gangPF: number): number {
  const x = gangPF + parts.parallelPF;
  const c = parts.padderPF === null ? x : (parts.padderPF * x) / (parts.padderPF + x);
  return RESONANCE_K / Math.sqrt(parts.inductanceUH * c);
}

const fmt = (kHz: number) => (kHz >= 10000 ? `${trim(kHz / 1000, 3)} MHz` : `${trim(kHz, 1)} kHz`);
function trim(x: number, digits: number): string {
  return String(Number(x.toFixed(digits)));
}
/** Three significant figures: an FM coil's change is hundredths of a µH, an LW padder's tens of pF. */
const sig = (x: number) => String(Number(x.toPrecision(3)));

function allowedKHz(t: WindowTolerance, markKHz: number): number {
  return Math.max(t.absKHz, (t.percent / 100) * markKHz);
}

type Prepared = {
  kind: BandKind;
  injection: Injection;
  gang: Required<Gang> & { source: "given" | "default" };
  solution: TrackingSolution;
  design: TrackingDesign;
  parts: OscillatorParts;
};

/** The design /api/tools/alignment computes for the same band, IF, injection, gang and points. */
function prepareDesign(input: DialFitInput): Prepared {
  // The engine's door: the band's kind (stated, or the one its frequencies belong to) and an IF of its family.
  const probe = checkTrackingBasis({
    band: input.band,
    ifKHz: input.ifKHz,
    injection: input.injection,
    gang: input.gang ?? DEFAULT_GANG_BY_KIND.MW,
  });
  const kind = probe.band.kind;
  const injection = probe.injection;
  const gang = input.gang
    ? { minPF: input.gang.minPF, maxPF: input.gang.maxPF, strayPF: input.gang.strayPF ?? 0, source: "given" as const }
    : { ...DEFAULT_GANG_BY_KIND[kind], source: "default" as const };
  const basis = checkTrackingBasis({ band: input.band, ifKHz: input.ifKHz, injection, gang });
  const points = input.trackingPointsKHz ?? ruleOfThumbPoints(input.band);
  const solution = solveTracking({ ...basis, trackingPointsKHz: points, samples: 2 });
  const design = solution.design;
  return {
    kind,
    injection,
    gang,
    solution,
    design,
    parts: { inductanceUH: design.oscillator.inductanceUH, parallelPF: design.oscillator.fixedPF, padderPF: design.oscillator.padderPF },
  };
}

type Observation = { index: number; dialKHz: number; gangPF: number; loKHz: number; receivedKHz: number };

function observe(input: DialFitInput, p: Prepared): Observation[] {
  const { band, ifKHz } = input;
  const readings = input.readings;
  if (!Array.isArray(readings) || readings.length < 2) {
    throw new EngineError("readings-too-few", "Give readings at two or more dial marks.", "readings");
  }
  const out: Observation[] = readings.map((r, i) => {
    const at = `readings.${i}`;
    if (!Number.isFinite(r.dialKHz)) throw new EngineError("not-finite", "Enter the dial mark in kHz.", `${at}.dialKHz`);
    if (r.dialKHz < band.lowKHz || r.dialKHz > band.highKHz) {
      throw new EngineError(
        "mark-outside-band",
        `The mark must lie on the band, ${fmt(band.lowKHz)}–${fmt(band.highKHz)}.`,
        `${at}.dialKHz`,
      );
    }
    const hasRx = r.receivedKHz !== undefined && r.receivedKHz !== null;
    const hasLo = r.loKHz !== undefined && r.loKHz !== null;
    if (hasRx === hasLo) {
      throw new EngineError(
        "reading-kind",
        "Give either the received frequency or the LO, not both.",
        hasRx ? `${at}.loKHz` : `${at}.receivedKHz`,
      );
    }
    const field = hasRx ? `${at}.receivedKHz` : `${at}.loKHz`;
    const value = (hasRx ? r.receivedKHz : r.loKHz) as number;
    if (!Number.isFinite(value) || value <= 0) throw new EngineError("not-positive", "A frequency must be greater than zero.", field);
    const loKHz = hasLo ? value : p.injection === "high" ? value + ifKHz : value - ifKHz;
    const receivedKHz = hasRx ? value : p.injection === "high" ? value - ifKHz : value + ifKHz;
    if (loKHz <= 0 || receivedKHz <= 0) {
      throw new EngineError(
        "reading-impossible",
        p.injection === "high"
          ? `With the oscillator above the signal the LO reads above the IF (${fmt(ifKHz)}).`
          : `With the oscillator below the signal the received frequency lies above the IF (${fmt(ifKHz)}).`,
        field,
      );
    }
    const designLo = oscillatorKHz(p.parts, gangSettingPF(p.design.signal, r.dialKHz));
    if (Math.abs(loKHz - designLo) > MAX_LO_DEVIATION * designLo) {
      throw new EngineError(
        "reading-impossible",
        `${fmt(value)} is too far from this mark for a drifted coil or trimmer (the oscillator should be near ${fmt(designLo)}): check the reading, and that it is not the image, ${fmt(2 * ifKHz)} away, or a harmonic.`,
        field,
      );
    }
    return { index: i, dialKHz: r.dialKHz, gangPF: gangSettingPF(p.design.signal, r.dialKHz), loKHz, receivedKHz };
  });
  const marks = out.map((o) => o.dialKHz);
  const minSpread = 0.1 * (band.highKHz - band.lowKHz);
  if (Math.max(...marks) - Math.min(...marks) < minSpread) {
    throw new EngineError(
      "readings-too-few",
      `Give readings at two or more marks at least ${fmt(minSpread)} apart, near each end of the band: one mark cannot tell the coil from the trimmer.`,
      "readings",
    );
  }
  return out;
}

/**
 * Levenberg–Marquardt on (ln L, T), padder held: two unknowns, so the normal equations are solved by hand.
 * The residuals are LO (or received, the same difference) minus reading, in kHz.
 */
export function fitOscillator(
  start: OscillatorParts,
  obs: readonly { gangPF: number; loKHz: number }[],
): { parts: OscillatorParts; rmsKHz: number; iterations: number } {
  const minGang = Math.min(...obs.map((o) => o.gangPF));
  const evaluate = (lnL: number, t: number) => {
    if (!(minGang + t > 0)) return null;
    const parts: OscillatorParts = { inductanceUH: Math.exp(lnL), parallelPF: t, padderPF: start.padderPF };
    let ss = 0;
    const r: number[] = [];
    const jl: number[] = [];
    const jt: number[] = [];
    for (const o of obs) {
      const f = oscillatorKHz(parts, o.gangPF);
      const x = o.gangPF + t;
      const c = start.padderPF === null ? x : (start.padderPF * x) / (start.padderPF + x);
      const dcdx = start.padderPF === null ? 1 : (start.padderPF / (start.padderPF + x)) ** 2;
      const e = f - o.loKHz;
      r.push(e);
      jl.push(-f / 2);
      jt.push((-f / (2 * c)) * dcdx);
      ss += e * e;
    }
    return Number.isFinite(ss) ? { ss, r, jl, jt } : null;
  };
  let lnL = Math.log(start.inductanceUH);
  let t = start.parallelPF;
  let cur = evaluate(lnL, t);
  if (!cur) throw new EngineError("fit-failed", "The design gives no oscillator at these marks.", "readings");
  let lambda = 1e-3;
  let iterations = 0;
  let converged = false;
  while (!converged && iterations < 100) {
    iterations++;
    let a11 = 0;
    let a12 = 0;
    let a22 = 0;
    let b1 = 0;
    let b2 = 0;
    for (let i = 0; i < cur.r.length; i++) {
      a11 += cur.jl[i] * cur.jl[i];
      a12 += cur.jl[i] * cur.jt[i];
      a22 += cur.jt[i] * cur.jt[i];
      b1 -= cur.jl[i] * cur.r[i];
      b2 -= cur.jt[i] * cur.r[i];
    }
    let accepted = false;
    for (let tries = 0; tries < 30 && !accepted; tries++) {
      const m11 = a11 * (1 + lambda);
      const m22 = a22 * (1 + lambda);
      const det = m11 * m22 - a12 * a12;
      if (!(Math.abs(det) > 0)) {
        lambda *= 10;
        continue;
      }
      const dl = (b1 * m22 - a12 * b2) / det;
      const dt = (m11 * b2 - a12 * b1) / det;
      const next = evaluate(lnL + dl, t + dt);
      if (next && next.ss <= cur.ss) {
        const small = Math.abs(dl) < 1e-12 && Math.abs(dt) < 1e-9 * Math.max(1, Math.abs(t));
        lnL += dl;
        t += dt;
        cur = next;
        lambda = Math.max(lambda / 10, 1e-12);
        accepted = true;
        converged = small;
      } else {
        lambda *= 10;
      }
    }
    if (!accepted || cur.ss === 0) break;
  }
  return {
    parts: { inductanceUH: Math.exp(lnL), parallelPF: t, padderPF: start.padderPF },
    rmsKHz: Math.sqrt(cur.ss / cur.r.length),
    iterations,
  };
}

/**
 * With the coil left as it is: the padder and parallel capacitance that put the LO on target at the low and
 * high tracking points. 1/C = 1/P + 1/(g + T) at both gives a quadratic in T, then P.
 */
export function solvePadderAndTrimmer(
  inductanceUH: number,
  low: { gangPF: number; loKHz: number },
  high: { gangPF: number; loKHz: number },
): { padderPF: number; parallelPF: number } | null {
  const inv = (f: number) => inductanceUH * w(f);
  const ga = low.gangPF;
  const gc = high.gangPF;
  // 1/C_c − 1/C_a = 1/(g_c+T) − 1/(g_a+T) = (g_a − g_c)/((g_a+T)(g_c+T)), so (g_a+T)(g_c+T) = k.
  const d = inv(high.loKHz) - inv(low.loKHz);
  if (!(d > 0) || !(ga > gc)) return null;
  const k = (ga - gc) / d;
  const s = ga + gc;
  const disc = s * s - 4 * (ga * gc - k);
  if (!(disc >= 0)) return null;
  const parallelPF = (-s + Math.sqrt(disc)) / 2;
  if (!(gc + parallelPF > 0)) return null;
  const invPadder = inv(high.loKHz) - 1 / (gc + parallelPF);
  if (!(invPadder > 0)) return null;
  return { padderPF: 1 / invPadder, parallelPF };
}

function stepText(
  adjust: FitStep["adjust"],
  direction: FitStep["direction"],
  amount: string,
  at: number,
  lo: number,
  kind: BandKind,
  injection: Injection,
): string {
  const where = `with the dial at ${fmt(at)} and the generator on ${fmt(at)}`;
  const goal = `until the signal peaks at the mark (LO ${fmt(lo)}, ${injection === "high" ? "above" : "below"} the signal)`;
  if (adjust === "coil") {
    const how =
      kind === "FM"
        ? direction === "increase"
          ? "squeeze the oscillator coil's turns together (or turn its slug further in)"
          : "spread the oscillator coil's turns (or turn its slug further out)"
        : direction === "increase"
          ? "turn the oscillator coil's slug further into the coil"
          : "turn the oscillator coil's slug further out of the coil";
    return `Low end: ${where}, ${how} to ${direction} its inductance by about ${amount}, ${goal}.`;
  }
  if (adjust === "padder") {
    return `Low end: ${where}, ${direction} the padder by about ${amount}, ${goal}.`;
  }
  const turn = direction === "increase" ? "closing it" : "opening it";
  return `High end: ${where}, ${direction} the oscillator trimmer's capacitance by about ${amount} (${turn}), ${goal}.`;
}

/** The fit, the verdicts before and after, and the steps that bring the set back to its design. */
export function fitDial(input: DialFitInput): DialFitResult {
  const p = prepareDesign(input);
  const lowEndAdjuster = input.lowEndAdjuster ?? "coil";
  if (lowEndAdjuster === "padder" && p.parts.padderPF === null) {
    throw new EngineError("no-padder", "This design has no padder: set the low end with the coil.", "lowEndAdjuster");
  }
  const obs = observe(input, p);
  const resolutionKHz = input.resolutionKHz ?? READING_RESOLUTION_KHZ[p.kind];
  const tolerance = input.tolerance ?? DEFAULT_DIAL_TOLERANCE[p.kind];
  const { ifKHz } = input;
  const rxOf = (lo: number) => (p.injection === "high" ? lo - ifKHz : lo + ifKHz);
  const loOf = (rx: number) => (p.injection === "high" ? rx + ifKHz : rx - ifKHz);

  const fitted = fitOscillator(p.parts, obs);
  const actual = fitted.parts;
  if (!Number.isFinite(fitted.rmsKHz) || fitted.rmsKHz > RESIDUAL_LIMIT_RESOLUTIONS * resolutionKHz) {
    throw new EngineError(
      "readings-unexplained",
      `These readings do not fit one setting of the oscillator (residual ${trim(fitted.rmsKHz, 2)} kHz against a reading resolution of ${trim(resolutionKHz, 2)} kHz): check each reading, the dial pointer's place on its cord, and for an image response.`,
      "readings",
    );
  }
  const lChange = actual.inductanceUH / p.parts.inductanceUH - 1;
  const minGang = Math.min(...obs.map((o) => o.gangPF), 0);
  if (Math.abs(lChange) > MAX_INDUCTANCE_CHANGE || actual.parallelPF + minGang <= 0 || actual.parallelPF < p.gang.minPF + p.gang.strayPF) {
    throw new EngineError(
      "readings-impossible",
      `These readings need an oscillator no slug or trimmer gives (inductance ${lChange >= 0 ? "+" : "−"}${trim(Math.abs(lChange) * 100, 1)} %, parallel capacitance ${trim(actual.parallelPF, 1)} pF against a gang minimum of ${trim(p.gang.minPF + p.gang.strayPF, 1)} pF): check the readings, the band, the IF and the gang.`,
      "readings",
    );
  }

  const [a, , c] = p.design.trackingPointsKHz as [number, number, number];
  const low = { dialKHz: a, gangPF: gangSettingPF(p.design.signal, a), loKHz: loOf(a) };
  const high = { dialKHz: c, gangPF: gangSettingPF(p.design.signal, c), loKHz: loOf(c) };

  let adjusted: OscillatorParts;
  if (lowEndAdjuster === "coil") {
    adjusted = { ...p.parts };
  } else {
    const solved = solvePadderAndTrimmer(actual.inductanceUH, low, high);
    if (!solved) {
      throw new EngineError(
        "padder-cannot",
        "With this coil no padder and trimmer bring both tracking points onto their marks: the coil itself needs setting.",
        "lowEndAdjuster",
      );
    }
    adjusted = { inductanceUH: actual.inductanceUH, parallelPF: solved.parallelPF, padderPF: solved.padderPF };
  }

  const judge = (dialKHz: number, receivedKHz: number) => {
    const errorKHz = receivedKHz - dialKHz;
    const allowed = allowedKHz(tolerance, dialKHz);
    return { errorKHz, allowedKHz: allowed, verdict: (Math.abs(errorKHz) <= allowed + 1e-9 ? "pass" : "fail") as DialVerdict };
  };
  const before = obs.map((o) => {
    const j = judge(o.dialKHz, o.receivedKHz);
    return {
      dialKHz: o.dialKHz,
      receivedKHz: o.receivedKHz,
      errorKHz: j.errorKHz,
      fittedErrorKHz: rxOf(oscillatorKHz(actual, o.gangPF)) - o.dialKHz,
      allowedKHz: j.allowedKHz,
      verdict: j.verdict,
    };
  });
  const after = obs.map((o) => {
    const receivedKHz = rxOf(oscillatorKHz(adjusted, o.gangPF));
    const j = judge(o.dialKHz, receivedKHz);
    return { dialKHz: o.dialKHz, receivedKHz, errorKHz: j.errorKHz, allowedKHz: j.allowedKHz, verdict: j.verdict };
  });
  const inTolerance = before.every((b) => b.verdict === "pass");

  // A step is worth giving when, alone, it moves the LO at its own point by more than the reading resolution.
  const steps: FitStep[] = [];
  const lowShift = Math.abs(
    oscillatorKHz({ ...actual, inductanceUH: adjusted.inductanceUH, padderPF: adjusted.padderPF }, low.gangPF) -
      oscillatorKHz(actual, low.gangPF),
  );
  if (lowShift > resolutionKHz) {
    if (lowEndAdjuster === "coil") {
      const delta = adjusted.inductanceUH - actual.inductanceUH;
      const direction = delta > 0 ? "increase" : "decrease";
      const amount = Math.abs(delta);
      const pct = (amount / actual.inductanceUH) * 100;
      steps.push({
        order: 0,
        adjust: "coil",
        direction,
        amount,
        unit: "µH",
        atDialKHz: a,
        targetLoKHz: low.loKHz,
        text: stepText("coil", direction, `${sig(amount)} µH (${trim(pct, 1)} %)`, a, low.loKHz, p.kind, p.injection),
      });
    } else {
      const delta = (adjusted.padderPF as number) - (actual.padderPF as number);
      const direction = delta > 0 ? "increase" : "decrease";
      const amount = Math.abs(delta);
      steps.push({
        order: 0,
        adjust: "padder",
        direction,
        amount,
        unit: "pF",
        atDialKHz: a,
        targetLoKHz: low.loKHz,
        text: stepText("padder", direction, `${sig(amount)} pF`, a, low.loKHz, p.kind, p.injection),
      });
    }
  }
  const highShift = Math.abs(
    oscillatorKHz({ ...actual, parallelPF: adjusted.parallelPF }, high.gangPF) - oscillatorKHz(actual, high.gangPF),
  );
  if (highShift > resolutionKHz) {
    const delta = adjusted.parallelPF - actual.parallelPF;
    const direction = delta > 0 ? "increase" : "decrease";
    const amount = Math.abs(delta);
    steps.push({
      order: 0,
      adjust: "trimmer",
      direction,
      amount,
      unit: "pF",
      atDialKHz: c,
      targetLoKHz: high.loKHz,
      text: stepText("trimmer", direction, `${sig(amount)} pF`, c, high.loKHz, p.kind, p.injection),
    });
  }
  steps.forEach((s, i) => (s.order = i + 1));

  const summary =
    steps.length === 0
      ? inTolerance
        ? "Every mark reads within tolerance and the oscillator is where the design puts it: nothing to turn."
        : "The oscillator is where the design puts it; what remains is the design's own tracking error, which no adjustment removes."
      : `${inTolerance ? "Every mark reads within tolerance; to bring the oscillator back to its design" : "To bring the dial into tolerance"}: ${steps
          .map(
            (s) =>
              `${s.direction} the ${s.adjust === "coil" ? "coil's inductance" : s.adjust === "padder" ? "padder" : "trimmer's capacitance"}`,
          )
          .join(", then ")}, each set at its tracking point. The two interact: repeat them, then take new readings.`;

  const sampleCurve = (parts: OscillatorParts, n = 41): ErrorPoint[] => {
    const { lowKHz, highKHz } = input.band;
    const marks = new Set<number>();
    for (let i = 0; i < n; i++) marks.add(i === n - 1 ? highKHz : lowKHz + ((highKHz - lowKHz) * i) / (n - 1));
    for (const o of obs) marks.add(o.dialKHz);
    return [...marks]
      .sort((x, y) => x - y)
      .map((kHz) => ({ kHz, errorKHz: rxOf(oscillatorKHz(parts, gangSettingPF(p.design.signal, kHz))) - kHz }));
  };

  return {
    bandKind: p.kind,
    injection: p.injection,
    gang: p.gang,
    trackingPointsKHz: [a, p.design.trackingPointsKHz[1] as number, c],
    lowEndAdjuster,
    design: p.parts,
    actual,
    adjusted,
    fit: {
      inductanceErrorPct: lChange * 100,
      parallelErrorPF: actual.parallelPF - p.parts.parallelPF,
      residualKHz: fitted.rmsKHz,
      iterations: fitted.iterations,
    },
    resolutionKHz,
    tolerance,
    before,
    after,
    inTolerance,
    steps,
    summary,
    curves: { before: sampleCurve(actual), after: sampleCurve(adjusted) },
  };
}
