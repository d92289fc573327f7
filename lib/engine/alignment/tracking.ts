import { EngineError } from "../engine-error";
import { RESONANCE_K } from "./frequencies";
import { checkTrackingPoints, type CheckedGang, type DialRange, type Injection, type TrackingBasis } from "./inputs";

/**
 * Model (see the tracking section of the reference figures): the gang section adds g ∈ [0, G] above its
 * minimum. Signal tank L_s with total fixed capacitance T_s; oscillator tank L_o with total parallel
 * capacitance T_o in series with a padder P. All in kHz, pF and µH.
 */
export type SignalCircuit = {
  swingPF: number;
  fixedPF: number;
  trimmerPF: number;
  inductanceUH: number;
};

export type OscillatorCircuit = {
  /** null when the design has no padder (trimmer-only tracking). */
  padderPF: number | null;
  fixedPF: number;
  trimmerPF: number;
  inductanceUH: number;
};

export type TrackingMethod = "three-point" | "padder-only" | "trimmer-only";

export type TrackingDesign = {
  method: TrackingMethod;
  band: DialRange;
  ifKHz: number;
  injection: Injection;
  gang: CheckedGang;
  signal: SignalCircuit;
  oscillator: OscillatorCircuit;
  trackingPointsKHz: number[];
};

/**
 * A band, its IF, the oscillator side and the gang, checked once at the engine's door
 * (checkTrackingBasis, or the alignment request parser): the designs below trust them.
 */
export type TrackingInput = TrackingBasis;

export type ErrorPoint = { kHz: number; errorKHz: number };

const w = (kHz: number) => (kHz / RESONANCE_K) ** 2;

/** T_s = G/(α² − 1) and L_s from the top of the band: the gang at minimum must reach the high end. */
export function designSignalCircuit(band: DialRange, gang: CheckedGang): SignalCircuit {
  const swingPF = gang.maxPF - gang.minPF;
  const alpha = band.highKHz / band.lowKHz;
  const fixedPF = swingPF / (alpha * alpha - 1);
  const trimmerPF = fixedPF - gang.minPF - gang.strayPF;
  if (trimmerPF < 0) {
    const need = (gang.minPF + gang.strayPF) * (alpha * alpha - 1) + gang.minPF;
    throw new EngineError(
      "gang-cannot-cover",
      `The gang cannot cover ${band.lowKHz}–${band.highKHz} kHz: with its minimum and strays of ` +
        `${round(gang.minPF + gang.strayPF, 2)} pF it would need a maximum of at least ${round(need, 1)} pF.`,
      "gang.maxPF",
    );
  }
  const inductanceUH = 1 / (fixedPF * w(band.highKHz));
  if (!(fixedPF > 0) || !Number.isFinite(inductanceUH) || !(inductanceUH > 0)) {
    throw new EngineError("band-absurd", "This band and gang give no realisable tuned circuit.", "band.highKHz");
  }
  return { swingPF, fixedPF, trimmerPF, inductanceUH };
}

/** Gang capacitance above minimum at which the signal tank tunes to kHz. */
export function gangSettingPF(signal: SignalCircuit, kHz: number): number {
  return 1 / (signal.inductanceUH * w(kHz)) - signal.fixedPF;
}

export function oscillatorKHzAt(osc: OscillatorCircuit, gangPF: number): number {
  const parallel = gangPF + osc.fixedPF;
  const c = osc.padderPF === null ? parallel : (osc.padderPF * parallel) / (osc.padderPF + parallel);
  return RESONANCE_K / Math.sqrt(osc.inductanceUH * c);
}

export function targetLoKHz(rfKHz: number, ifKHz: number, injection: Injection): number {
  return injection === "high" ? rfKHz + ifKHz : rfKHz - ifKHz;
}

/** e(f) = f_o − (f ± f_IF) at the gang setting that tunes the signal tank to f. */
export function trackingErrorKHz(design: TrackingDesign, kHz: number): number {
  const g = gangSettingPF(design.signal, kHz);
  return oscillatorKHzAt(design.oscillator, g) - targetLoKHz(kHz, design.ifKHz, design.injection);
}

function unrealisable(message: string, field = "trackingPointsKHz"): never {
  throw new EngineError("tracking-unrealisable", message, field);
}

function finishOscillator(
  padderPF: number | null,
  fixedPF: number,
  inductanceUH: number,
  gang: CheckedGang,
  injection: Injection,
): OscillatorCircuit {
  if (padderPF !== null && (!Number.isFinite(padderPF) || padderPF <= 0)) {
    unrealisable(
      injection === "low"
        ? "With the oscillator below the signal it needs a wider capacitance ratio than the signal section, which a series padder cannot give."
        : "These tracking points need a padder that is not a real capacitor; move the points.",
      injection === "low" ? "injection" : "trackingPointsKHz",
    );
  }
  if (!Number.isFinite(fixedPF) || !Number.isFinite(inductanceUH) || inductanceUH <= 0) {
    unrealisable("These tracking points have no realisable oscillator; move the points.");
  }
  const trimmerPF = fixedPF - gang.minPF - gang.strayPF;
  if (trimmerPF < -1e-9) {
    unrealisable("These tracking points need less oscillator capacitance than the gang minimum and strays; move the points.");
  }
  return { padderPF, fixedPF, trimmerPF: Math.max(trimmerPF, 0), inductanceUH };
}

function prepare(input: TrackingInput) {
  const { band, ifKHz, injection, gang } = input;
  return { band: { lowKHz: band.lowKHz, highKHz: band.highKHz }, ifKHz, injection, gang, signal: designSignalCircuit(band, gang) };
}

/**
 * Exact three-point solve. With w = (f_o/K)² the tracking condition is L_o·w_k = 1/P + 1/(g_k + T_o);
 * differencing pairs removes 1/P, and the ratio of two differences removes L_o, leaving T_o linear.
 */
export function designThreePoint(input: TrackingInput & { trackingPointsKHz: readonly number[] }): TrackingDesign {
  const { band, ifKHz, injection, gang, signal } = prepare(input);
  const points = checkTrackingPoints(input.trackingPointsKHz, band, 3);
  const g = points.map((f) => gangSettingPF(signal, f));
  const wo = points.map((f) => w(targetLoKHz(f, ifKHz, injection)));
  const r = ((wo[0] - wo[1]) * (g[2] - g[1])) / ((wo[1] - wo[2]) * (g[1] - g[0]));
  if (!Number.isFinite(r) || Math.abs(r - 1) < 1e-12)
    unrealisable("These tracking points give no unique oscillator design; spread them out.");
  const fixedPF = (g[2] - r * g[0]) / (r - 1);
  const x0 = g[0] + fixedPF;
  const x1 = g[1] + fixedPF;
  if (x0 <= 0 || x1 <= 0) unrealisable("These tracking points have no realisable oscillator; move the points.");
  const inductanceUH = (g[1] - g[0]) / ((wo[0] - wo[1]) * x0 * x1);
  const inversePadder = inductanceUH * wo[0] - 1 / x0;
  const oscillator = finishOscillator(inversePadder > 0 ? 1 / inversePadder : -1, fixedPF, inductanceUH, gang, injection);
  return { method: "three-point", band, ifKHz, injection, gang, signal, oscillator, trackingPointsKHz: points };
}

/**
 * Two-point design with a padder only: the oscillator section carries the same fixed capacitance as the
 * signal section (same gang, same trimmer), so only P and L_o are free.
 */
export function designPadderOnly(input: TrackingInput & { trackingPointsKHz?: readonly number[] }): TrackingDesign {
  const { band, ifKHz, injection, gang, signal } = prepare(input);
  const points = checkTrackingPoints(input.trackingPointsKHz ?? [band.lowKHz, band.highKHz], band, 2);
  const fixedPF = signal.fixedPF;
  const x = points.map((f) => gangSettingPF(signal, f) + fixedPF);
  const wo = points.map((f) => w(targetLoKHz(f, ifKHz, injection)));
  const inductanceUH = (1 / x[0] - 1 / x[1]) / (wo[0] - wo[1]);
  const inversePadder = inductanceUH * wo[0] - 1 / x[0];
  const oscillator = finishOscillator(inversePadder > 0 ? 1 / inversePadder : -1, fixedPF, inductanceUH, gang, injection);
  return { method: "padder-only", band, ifKHz, injection, gang, signal, oscillator, trackingPointsKHz: points };
}

/** Two-point design with no padder: the oscillator's own trimmer and inductance are free. */
export function designTrimmerOnly(input: TrackingInput & { trackingPointsKHz?: readonly number[] }): TrackingDesign {
  const { band, ifKHz, injection, gang, signal } = prepare(input);
  const points = checkTrackingPoints(input.trackingPointsKHz ?? [band.lowKHz, band.highKHz], band, 2);
  const g = points.map((f) => gangSettingPF(signal, f));
  const wo = points.map((f) => w(targetLoKHz(f, ifKHz, injection)));
  const fixedPF = (wo[1] * g[1] - wo[0] * g[0]) / (wo[0] - wo[1]);
  const inductanceUH = 1 / (wo[0] * (g[0] + fixedPF));
  const oscillator = finishOscillator(null, fixedPF, inductanceUH, gang, injection);
  return { method: "trimmer-only", band, ifKHz, injection, gang, signal, oscillator, trackingPointsKHz: points };
}

const GOLDEN = (Math.sqrt(5) - 1) / 2;

/** Largest |measure| on [a, b], assuming it is unimodal there (true between consecutive zeros of the error). */
function peakOnSegment(
  design: TrackingDesign,
  a: number,
  b: number,
  measure: (f: number) => number = (f) => trackingErrorKHz(design, f),
): number {
  const abs = (f: number) => Math.abs(measure(f));
  let lo = a;
  let hi = b;
  let c = hi - GOLDEN * (hi - lo);
  let d = lo + GOLDEN * (hi - lo);
  let fc = abs(c);
  let fd = abs(d);
  for (let i = 0; i < 48 && hi - lo > 1e-7 * (b - a); i++) {
    if (fc > fd) {
      hi = d;
      d = c;
      fd = fc;
      c = hi - GOLDEN * (hi - lo);
      fc = abs(c);
    } else {
      lo = c;
      c = d;
      fc = fd;
      d = lo + GOLDEN * (hi - lo);
      fd = abs(d);
    }
  }
  const candidates = [a, b, (lo + hi) / 2];
  let best = candidates[0];
  for (const f of candidates) if (abs(f) > abs(best)) best = f;
  return best;
}

function segments(design: TrackingDesign): [number, number][] {
  const edges = [design.band.lowKHz, ...design.trackingPointsKHz, design.band.highKHz];
  const out: [number, number][] = [];
  for (let i = 1; i < edges.length; i++) if (edges[i] - edges[i - 1] > 0) out.push([edges[i - 1], edges[i]]);
  return out;
}

/** The error's extrema between band ends and tracking points: where the worst mistracking is. */
export function errorExtrema(design: TrackingDesign): ErrorPoint[] {
  return segments(design).map(([a, b]) => {
    const kHz = peakOnSegment(design, a, b);
    return { kHz, errorKHz: trackingErrorKHz(design, kHz) };
  });
}

/**
 * What mistracking costs the set. With the dial (and so the antenna circuit) at f, the station the set
 * receives is at f + e, so the antenna circuit meets it detuned by ρ = (f + e)/f − f/(f + e). A single
 * tuned circuit of loaded Q passes it at 1/√(1 + Q²ρ²): the loss is 10·log10(1 + Q²ρ²) dB. Since the
 * bandwidth is f/Q, the same error in kHz costs more at the low end of the band than at the top.
 */
export function detuning(design: TrackingDesign, kHz: number): number {
  const received = kHz + trackingErrorKHz(design, kHz);
  return received / kHz - kHz / received;
}

export function sensitivityLossDbAt(rho: number, loadedQ: number): number {
  return 10 * Math.log10(1 + loadedQ * loadedQ * rho * rho);
}

export type LossPoint = { kHz: number; errorKHz: number; detuning: number };

/** The detuning's extrema between band ends and tracking points. */
export function detuningExtrema(design: TrackingDesign): LossPoint[] {
  return segments(design).map(([a, b]) => {
    const kHz = peakOnSegment(design, a, b, (f) => detuning(design, f));
    return { kHz, errorKHz: trackingErrorKHz(design, kHz), detuning: detuning(design, kHz) };
  });
}

/** The largest |ρ| over the band: the measure the minimax points equalise. */
export function maxAbsDetuning(design: TrackingDesign): number {
  return Math.max(...detuningExtrema(design).map((p) => Math.abs(p.detuning)));
}

/** The worst-case sensitivity loss over the band at a loaded Q, and where it falls. */
export function worstSensitivityLoss(design: TrackingDesign, loadedQ: number): { dB: number; kHz: number; errorKHz: number } {
  const worst = detuningExtrema(design).reduce((a, b) => (Math.abs(b.detuning) > Math.abs(a.detuning) ? b : a));
  return { dB: sensitivityLossDbAt(worst.detuning, loadedQ), kHz: worst.kHz, errorKHz: worst.errorKHz };
}

export function maxAbsErrorKHz(design: TrackingDesign): number {
  return Math.max(...errorExtrema(design).map((p) => Math.abs(p.errorKHz)));
}

/** Evenly spaced samples across the band, with the tracking points themselves included. */
export function sampleErrorCurve(design: TrackingDesign, samples = 101): ErrorPoint[] {
  const n = Math.max(2, Math.floor(samples));
  const { lowKHz, highKHz } = design.band;
  const fs = new Set<number>();
  for (let i = 0; i < n; i++) fs.add(i === n - 1 ? highKHz : lowKHz + ((highKHz - lowKHz) * i) / (n - 1));
  for (const p of design.trackingPointsKHz) fs.add(p);
  return [...fs].sort((a, b) => a - b).map((kHz) => ({ kHz, errorKHz: trackingErrorKHz(design, kHz) }));
}

function round(x: number, digits: number): number {
  const m = 10 ** digits;
  return Math.round(x * m) / m;
}
