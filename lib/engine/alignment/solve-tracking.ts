import { EngineError } from "../engine-error";
import {
  designPadderOnly,
  designThreePoint,
  designTrimmerOnly,
  maxAbsErrorKHz,
  sampleErrorCurve,
  type ErrorPoint,
  type TrackingDesign,
  type TrackingInput,
} from "./tracking";
import { ruleOfThumbPoints } from "./tracking-points";

export type TrackingSolution = {
  design: TrackingDesign;
  signalInductanceUH: number;
  signalFixedPF: number;
  signalTrimmerPF: number;
  padderPF: number;
  oscillatorFixedPF: number;
  oscillatorTrimmerPF: number;
  oscillatorInductanceUH: number;
  trackingPointsKHz: [number, number, number];
  maxAbsErrorKHz: number;
  errorCurve: ErrorPoint[];
};

/** The three-point design the bench uses, flattened for display, with its error curve. */
export function solveTracking(input: TrackingInput & { trackingPointsKHz?: readonly number[]; samples?: number }): TrackingSolution {
  const points = input.trackingPointsKHz ?? ruleOfThumbPoints(input.band);
  const design = designThreePoint({ ...input, trackingPointsKHz: points });
  const [a, b, c] = design.trackingPointsKHz;
  const padderPF = design.oscillator.padderPF;
  if (padderPF === null) {
    throw new EngineError("tracking-unrealisable", "This design has no padder.", "trackingPointsKHz");
  }
  const maxAbs = maxAbsErrorKHz(design);
  const errorCurve = sampleErrorCurve(design, input.samples ?? 101);
  // Last guard against overflow at absurd extremes: no NaN or Infinity ever leaves the solver.
  if (!Number.isFinite(maxAbs) || !errorCurve.every((p) => Number.isFinite(p.errorKHz)) || !Number.isFinite(padderPF)) {
    throw new EngineError("tracking-unrealisable", "These inputs give no usable tracking design.", "trackingPointsKHz");
  }
  return {
    design,
    signalInductanceUH: design.signal.inductanceUH,
    signalFixedPF: design.signal.fixedPF,
    signalTrimmerPF: design.signal.trimmerPF,
    padderPF,
    oscillatorFixedPF: design.oscillator.fixedPF,
    oscillatorTrimmerPF: design.oscillator.trimmerPF,
    oscillatorInductanceUH: design.oscillator.inductanceUH,
    trackingPointsKHz: [a, b, c],
    maxAbsErrorKHz: maxAbs,
    errorCurve,
  };
}

export type ComparisonDesign =
  | { method: "padder-only" | "trimmer-only"; ok: true; design: TrackingDesign; maxAbsErrorKHz: number; errorCurve: ErrorPoint[] }
  | { method: "padder-only" | "trimmer-only"; ok: false; reason: string };

/** Two-point designs tracked at the band ends, to show what the third point buys. */
export function compareTwoPointDesigns(input: TrackingInput, samples = 51): ComparisonDesign[] {
  const build = (method: "padder-only" | "trimmer-only"): ComparisonDesign => {
    try {
      const design = method === "padder-only" ? designPadderOnly(input) : designTrimmerOnly(input);
      return { method, ok: true, design, maxAbsErrorKHz: maxAbsErrorKHz(design), errorCurve: sampleErrorCurve(design, samples) };
    } catch (e) {
      // Only the engine's own verdict on the inputs is a "not realisable"; anything else is a bug.
      if (e instanceof EngineError) return { method, ok: false, reason: e.message };
      throw e;
    }
  };
  return [build("padder-only"), build("trimmer-only")];
}
