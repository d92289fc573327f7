import { EngineError } from "../engine-error";
import { minimiseNelderMead } from "./nelder-mead";
import { designThreePoint, maxAbsDetuning, maxAbsErrorKHz, type TrackingDesign, type TrackingInput } from "./tracking";
import { ruleOfThumbPoints } from "./tracking-points";

const PENALTY = 1e12;

/**
 * What the minimax points equalise. "detuning" (the default) is the error relative to the antenna
 * circuit's bandwidth, ρ = f_r/f − f/f_r, which is what the set loses in gain and selectivity; "kHz"
 * is the plain error in kHz, which spends the low end of the band where the bandwidth is narrowest.
 */
export type MinimaxMeasure = "detuning" | "kHz";

export type MinimaxResult = { design: TrackingDesign; maxAbsErrorKHz: number; maxAbsDetuning: number; measure: MinimaxMeasure };

/**
 * Minimax (equal-ripple) tracking points: the three points whose design has the smallest worst case of
 * the chosen measure over the band. Searched in log-frequency, started from the rule-of-thumb points.
 * The worst-case detuning does not depend on the loaded Q, so neither do the points.
 */
export function solveMinimaxPoints(input: TrackingInput, measure: MinimaxMeasure = "detuning"): MinimaxResult {
  const start = ruleOfThumbPoints(input.band);
  const lo = Math.log(input.band.lowKHz);
  const hi = Math.log(input.band.highKHz);
  const span = hi - lo;
  const toPoints = (x: number[]) => x.map((t) => Math.exp(lo + t * span));
  const worst = measure === "kHz" ? maxAbsErrorKHz : maxAbsDetuning;
  const objective = (x: number[]) => {
    if (x.some((t) => t < 0 || t > 1) || !(x[0] < x[1] && x[1] < x[2]) || x[1] - x[0] < 2e-3 || x[2] - x[1] < 2e-3) {
      return PENALTY;
    }
    try {
      const value = worst(designThreePoint({ ...input, trackingPointsKHz: toPoints(x) }));
      return Number.isFinite(value) ? value : PENALTY;
    } catch {
      return PENALTY;
    }
  };
  const x0 = start.map((f) => (Math.log(f) - lo) / span);
  let best = minimiseNelderMead(objective, x0, [0.04, 0.04, 0.04], { tolerance: 1e-9 });
  // A restart from the first answer escapes the occasional collapse of the simplex on a ridge.
  best = minimiseNelderMead(objective, best.x, [0.01, 0.01, 0.01], { tolerance: 1e-11 });
  if (best.fx >= PENALTY) {
    throw new EngineError("tracking-unrealisable", "No three tracking points give a realisable design on this band.", "gang");
  }
  const design = designThreePoint({ ...input, trackingPointsKHz: toPoints(best.x) });
  return { design, maxAbsErrorKHz: maxAbsErrorKHz(design), maxAbsDetuning: maxAbsDetuning(design), measure };
}
