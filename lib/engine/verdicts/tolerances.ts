import { z } from "zod";
import type { BandKind } from "../bands/band";

/** |reading − mark| ≤ max(absKHz, percent % of the mark): "whichever is larger". */
export const windowToleranceSchema = z.object({
  absKHz: z.number().min(0).max(10000),
  percent: z.number().min(0).max(50),
});
export type WindowTolerance = z.infer<typeof windowToleranceSchema>;

/**
 * One dial-calibration tolerance per band kind, in received frequency. The received frequency at a mark is
 * the LO minus the IF (plus, with the LO below), so a received-frequency reading and an LO reading of the
 * same error get the same window and the same verdict. (A stored `lo` figure from older settings is ignored.)
 */
export const bandTolerancesSchema = z.object({
  dial: windowToleranceSchema,
  ifPeak: windowToleranceSchema,
});
export type BandTolerances = z.infer<typeof bandTolerancesSchema>;

export const toleranceSettingsSchema = z.object({
  byBandKind: z.object({ LW: bandTolerancesSchema, MW: bandTolerancesSchema, SW: bandTolerancesSchema, FM: bandTolerancesSchema }),
  /** Leakage limits in mA by mains voltage of a two-wire set. */
  leakageLimitMA: z.object({ v120: z.number().positive().max(10), v230: z.number().positive().max(10) }),
  /** B+ against the schematic figure, when the profile gives one. */
  bPlusPercent: z.number().min(0).max(50),
});
export type ToleranceSettings = z.infer<typeof toleranceSettingsSchema>;

/**
 * Defaults: MW dial calibration within max(10 kHz, 1 %) of the mark; SW within 2 %; both read either as
 * the received frequency or as the LO against mark + IF;
 * leakage 0.5 mA at 120 V and 0.233 mA at 230 V. LW and FM figures are the shop's own choice.
 */
export const defaultTolerances: ToleranceSettings = {
  byBandKind: {
    LW: { dial: { absKHz: 5, percent: 1 }, ifPeak: { absKHz: 2, percent: 0 } },
    MW: { dial: { absKHz: 10, percent: 1 }, ifPeak: { absKHz: 2, percent: 0 } },
    SW: { dial: { absKHz: 0, percent: 2 }, ifPeak: { absKHz: 2, percent: 0 } },
    FM: { dial: { absKHz: 200, percent: 0.5 }, ifPeak: { absKHz: 50, percent: 0 } },
  },
  leakageLimitMA: { v120: 0.5, v230: 0.233 },
  bPlusPercent: 10,
};

export function tolerancesFor(settings: ToleranceSettings, kind: BandKind): BandTolerances {
  return settings.byBandKind[kind];
}
