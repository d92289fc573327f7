import { z } from "../zod";
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

/**
 * The published ceilings for leakage from exposed metal of a two-wire set, in mA rms: a shop may set a
 * stricter limit, never a looser one.
 *  - 120 V: 0.5 mA, the UL 101 two-wire limit that US service manuals check as 0.75 V rms across
 *    1.5 kΩ ∥ 0.15 µF.
 *  - 230 V: IEC 60065 Annex D, touch current not hazardous up to 0.7 mA peak; on a sine that is
 *    0.7 / √2 = 0.495 mA rms, taken down to 0.49 so that the figure kept never exceeds the standard's.
 */
export const leakageCeilings = {
  v120: { limitMA: 0.5, source: "UL 101 two-wire limit (US service-manual hot check)" },
  v230: { limitMA: 0.49, source: "IEC 60065 Annex D (0.7 mA peak)" },
} as const;

const leakageLimit = (volts: "120" | "230") => {
  const c = leakageCeilings[`v${volts}`];
  return z
    .number({ error: `Leakage limit at ${volts} V: enter a number of mA.` })
    .positive(`Leakage limit at ${volts} V: more than 0 mA.`)
    .max(
      c.limitMA,
      `Leakage limit at ${volts} V: at most ${c.limitMA} mA, the published limit (${c.source}); a shop may only be stricter.`,
    );
};

export const toleranceSettingsSchema = z.object({
  byBandKind: z.object({ LW: bandTolerancesSchema, MW: bandTolerancesSchema, SW: bandTolerancesSchema, FM: bandTolerancesSchema }),
  /** Leakage limits in mA by mains voltage of a two-wire set. */
  leakageLimitMA: z.object({ v120: leakageLimit("120"), v230: leakageLimit("230") }),
  /** B+ against the schematic figure, when the profile gives one. */
  bPlusPercent: z.number().min(0).max(50),
});
export type ToleranceSettings = z.infer<typeof toleranceSettingsSchema>;

/**
 * Defaults: MW dial calibration within max(10 kHz, 1 %) of the mark; SW within 2 %; both read either as
 * the received frequency or as the LO against mark + IF; leakage at the published ceilings (0.5 mA at
 * 120 V, 0.49 mA rms at 230 V). LW and FM figures are the shop's own choice.
 */
export const defaultTolerances: ToleranceSettings = {
  byBandKind: {
    LW: { dial: { absKHz: 5, percent: 1 }, ifPeak: { absKHz: 2, percent: 0 } },
    MW: { dial: { absKHz: 10, percent: 1 }, ifPeak: { absKHz: 2, percent: 0 } },
    SW: { dial: { absKHz: 0, percent: 2 }, ifPeak: { absKHz: 2, percent: 0 } },
    FM: { dial: { absKHz: 200, percent: 0.5 }, ifPeak: { absKHz: 50, percent: 0 } },
  },
  leakageLimitMA: { v120: leakageCeilings.v120.limitMA, v230: leakageCeilings.v230.limitMA },
  bPlusPercent: 10,
};

export function tolerancesFor(settings: ToleranceSettings, kind: BandKind): BandTolerances {
  return settings.byBandKind[kind];
}
