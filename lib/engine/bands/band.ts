import { z } from "../zod";

export const bandKinds = ["LW", "MW", "SW", "FM"] as const;
export type BandKind = (typeof bandKinds)[number];
export const bandKindSchema = z.enum(bandKinds);

/** A band as printed on a set's dial. Frequencies are always kHz, FM included (88–108 MHz is 88000–108000). */
export type Band = {
  kind: BandKind;
  lowKHz: number;
  highKHz: number;
  ifKHz: number;
  label?: string;
  /** The LO runs above the signal unless the set says otherwise. */
  injection?: Injection;
  /** The service manual's own tracking points, low to high; the rule-of-thumb points otherwise. */
  trackingPointsKHz?: [number, number, number];
};

export const injections = ["high", "low"] as const;
export type Injection = (typeof injections)[number];
export const injectionSchema = z.enum(injections);

export type ItuRegion = 1 | 2 | 3;

/** Plausible printed dial ranges per band kind; anything outside is almost certainly a unit mistake. */
export const plausibleBandRangeKHz: Record<BandKind, { min: number; max: number }> = {
  LW: { min: 100, max: 520 },
  MW: { min: 400, max: 1800 },
  SW: { min: 1500, max: 30000 },
  FM: { min: 64000, max: 110000 },
};

/**
 * The kind a dial range belongs to when the set does not say: LW ends by 520 kHz, FM (and anything VHF)
 * starts at 30 MHz or above, a dial reaching past 1800 kHz is shortwave, the rest is MW. The IF plays no part.
 */
export function bandKindForRange(band: { lowKHz: number; highKHz: number }): BandKind {
  if (band.highKHz <= plausibleBandRangeKHz.LW.max) return "LW";
  if (band.lowKHz >= 30000) return "FM";
  if (band.highKHz > plausibleBandRangeKHz.MW.max) return "SW";
  return "MW";
}
