import { requirePositive } from "../engine-error";
import { hfBroadcastBandsFor } from "./presets";
import type { ItuRegion } from "./band";

export const speedOfLightKmPerS = 299_792.458;

/** λ in metres for a frequency in kHz: λ = c / f with c in km/s gives metres directly. */
export function wavelengthMetres(kHz: number): number {
  requirePositive(kHz, "kHz", "Frequency");
  return speedOfLightKmPerS / kHz;
}

/** The HF broadcast band a frequency falls in ("49 m"), or null outside every band. */
export function metreBandLabel(kHz: number, region: ItuRegion = 2): string | null {
  requirePositive(kHz, "kHz", "Frequency");
  const band = hfBroadcastBandsFor(region).find((b) => kHz >= b.lowKHz && kHz <= b.highKHz);
  return band ? band.label : null;
}

/** The broadcast bands a set's shortwave dial range reaches, for the dial legend on the bench sheet. */
export function metreBandsCovered(lowKHz: number, highKHz: number, region: ItuRegion = 2): string[] {
  return hfBroadcastBandsFor(region)
    .filter((b) => b.highKHz >= lowKHz && b.lowKHz <= highKHz)
    .map((b) => b.label);
}
