import { EngineError } from "../engine-error";
import { minimiseNelderMead } from "./nelder-mead";
import { designThreePoint, errorExtrema, maxAbsErrorKHz, type TrackingDesign, type TrackingInput } from "./tracking";
import { ruleOfThumbPoints } from "./tracking-points";

const PENALTY = 1e12;

/**
 * Minimax (equal-ripple) tracking points: the three points whose design has the smallest worst-case
 * error over the band. Searched in log-frequency, started from the rule-of-thumb points.
 */
export function solveMinimaxPoints(input: TrackingInput): { design: TrackingDesign; maxAbsErrorKHz: number } {
  const start = ruleOfThumbPoints(input.band);
  // Validates every input once, so errors name the caller's fields and not the search.
  designThreePoint({ ...input, trackingPointsKHz: start });
  const lo = Math.log(input.band.lowKHz);
  const hi = Math.log(input.band.highKHz);
  const span = hi - lo;
  const toPoints = (x: number[]) => x.map((t) => Math.exp(lo + t * span));
  const objective = (x: number[]) => {
    if (x.some((t) => t < 0 || t > 1) || !(x[0] < x[1] && x[1] < x[2]) || x[1] - x[0] < 2e-3 || x[2] - x[1] < 2e-3) {
      return PENALTY;
    }
    try {
      return maxAbsErrorKHz(designThreePoint({ ...input, trackingPointsKHz: toPoints(x) }));
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
  return { design, maxAbsErrorKHz: Math.max(...errorExtrema(design).map((p) => Math.abs(p.errorKHz))) };
}
