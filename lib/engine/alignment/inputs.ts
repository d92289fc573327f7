import { EngineError, requireFinite, requirePositive } from "../engine-error";
import { ifFamilyOf, plausibleIfRangeKHz } from "../bands/if-presets";

import type { Injection } from "../bands/band";

export type { Injection };
export type DialRange = { lowKHz: number; highKHz: number };
export type Gang = { minPF: number; maxPF: number; strayPF?: number };

export const MIN_DIAL_KHZ = 30;
export const MAX_DIAL_KHZ = 1_000_000;
export const MAX_DIAL_RATIO = 20;

export function checkDialRange(band: DialRange, prefix = "band"): DialRange {
  requirePositive(band.lowKHz, `${prefix}.lowKHz`, "The low end of the band");
  requirePositive(band.highKHz, `${prefix}.highKHz`, "The high end of the band");
  if (band.lowKHz >= band.highKHz) {
    throw new EngineError("band-order", "The low end of the band must be below the high end.", `${prefix}.lowKHz`);
  }
  // No receiver dial starts below LF or spans more than this; beyond it the figures are typing errors.
  if (band.lowKHz < MIN_DIAL_KHZ) {
    throw new EngineError("band-absurd", `A dial starts at ${MIN_DIAL_KHZ} kHz or above.`, `${prefix}.lowKHz`);
  }
  if (band.highKHz > MAX_DIAL_KHZ) {
    throw new EngineError("band-absurd", `A dial ends at ${MAX_DIAL_KHZ} kHz or below.`, `${prefix}.highKHz`);
  }
  if (band.highKHz / band.lowKHz > MAX_DIAL_RATIO) {
    throw new EngineError("band-absurd", `A single band spans at most ${MAX_DIAL_RATIO}:1 in frequency.`, `${prefix}.highKHz`);
  }
  return band;
}

export function checkIf(ifKHz: number, field = "ifKHz"): number {
  requirePositive(ifKHz, field, "The IF");
  if (ifFamilyOf(ifKHz) === null) {
    const { AM, FM } = plausibleIfRangeKHz;
    throw new EngineError("if-out-of-range", `The IF must lie in ${AM.min}–${AM.max} kHz (AM) or ${FM.min}–${FM.max} kHz (FM).`, field);
  }
  return ifKHz;
}

/** With the LO below the signal it must stay above zero across the band. */
export function checkInjection(band: DialRange, ifKHz: number, injection: Injection, prefix = "band"): void {
  if (injection === "low" && band.lowKHz <= ifKHz) {
    throw new EngineError("lo-below-zero", "With low-side injection the low end of the band must be above the IF.", `${prefix}.lowKHz`);
  }
}

export function checkGang(gang: Gang, prefix = "gang"): Required<Gang> {
  requireFinite(gang.minPF, `${prefix}.minPF`, "The gang minimum");
  requirePositive(gang.maxPF, `${prefix}.maxPF`, "The gang maximum");
  const strayPF = gang.strayPF ?? 0;
  requireFinite(strayPF, `${prefix}.strayPF`, "The stray capacitance");
  if (gang.minPF < 0) throw new EngineError("negative", "The gang minimum cannot be negative.", `${prefix}.minPF`);
  if (strayPF < 0) throw new EngineError("negative", "The stray capacitance cannot be negative.", `${prefix}.strayPF`);
  if (gang.maxPF <= gang.minPF) {
    throw new EngineError("gang-order", "The gang maximum must be above its minimum.", `${prefix}.maxPF`);
  }
  return { minPF: gang.minPF, maxPF: gang.maxPF, strayPF };
}
