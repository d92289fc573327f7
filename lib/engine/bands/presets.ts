import type { Band, BandKind, ItuRegion } from "./band";

export type BandAllocation = { id: string; kind: BandKind; label: string; lowKHz: number; highKHz: number };

/** Allocations, i.e. what the regulations set aside. A set's own dial range is what the engine uses. */
export const amAllocations = {
  "us-am": { id: "us-am", kind: "MW", label: "US AM broadcast", lowKHz: 535, highKHz: 1705 },
  "mw-region-1-3": { id: "mw-region-1-3", kind: "MW", label: "MF broadcasting, Regions 1 and 3", lowKHz: 526.5, highKHz: 1606.5 },
  "mw-region-2": { id: "mw-region-2", kind: "MW", label: "MF broadcasting, Region 2", lowKHz: 535, highKHz: 1605 },
  "mw-region-2-extended": {
    id: "mw-region-2-extended",
    kind: "MW",
    label: "Region 2 extended band (1988 plan)",
    lowKHz: 1605,
    highKHz: 1705,
  },
  "lw-region-1": { id: "lw-region-1", kind: "LW", label: "LF broadcasting, Region 1", lowKHz: 148.5, highKHz: 283.5 },
} as const satisfies Record<string, BandAllocation>;

export type HfBroadcastBand = { metres: number; label: string; lowKHz: number; highKHz: number };

export const hfBroadcastBands: readonly HfBroadcastBand[] = [
  { metres: 49, label: "49 m", lowKHz: 5900, highKHz: 6200 },
  { metres: 41, label: "41 m", lowKHz: 7200, highKHz: 7450 },
  { metres: 31, label: "31 m", lowKHz: 9400, highKHz: 9900 },
  { metres: 25, label: "25 m", lowKHz: 11600, highKHz: 12100 },
  { metres: 22, label: "22 m", lowKHz: 13570, highKHz: 13870 },
  { metres: 19, label: "19 m", lowKHz: 15100, highKHz: 15800 },
  { metres: 16, label: "16 m", lowKHz: 17480, highKHz: 17900 },
  { metres: 15, label: "15 m", lowKHz: 18900, highKHz: 19020 },
  { metres: 13, label: "13 m", lowKHz: 21450, highKHz: 21850 },
  { metres: 11, label: "11 m", lowKHz: 25670, highKHz: 26100 },
];

/** Region 2 has a narrower 41 m broadcast segment. */
export function hfBroadcastBandsFor(region: ItuRegion): HfBroadcastBand[] {
  return hfBroadcastBands.map((b) => (region === 2 && b.metres === 41 ? { ...b, lowKHz: 7300, highKHz: 7400 } : { ...b }));
}

export type DialPreset = { id: string; label: string; band: Omit<Band, "ifKHz"> & { ifKHz: number } };

/**
 * Default dial ranges that fill a new band on the quote and triage forms. Sets print their own
 * ranges, and the technician corrects them at triage.
 */
export function dialPresetsFor(region: ItuRegion): DialPreset[] {
  const mw: DialPreset[] =
    region === 2
      ? [
          { id: "mw", label: "MW 540–1700 kHz", band: { kind: "MW", lowKHz: 540, highKHz: 1700, ifKHz: 455 } },
          { id: "mw-older", label: "MW 540–1600 kHz (older dials)", band: { kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455 } },
        ]
      : [{ id: "mw", label: "MW 531–1602 kHz", band: { kind: "MW", lowKHz: 531, highKHz: 1602, ifKHz: 470 } }];
  const lw: DialPreset[] =
    region === 1 ? [{ id: "lw", label: "LW 150–285 kHz", band: { kind: "LW", lowKHz: 150, highKHz: 285, ifKHz: 470 } }] : [];
  const amIf = region === 2 ? 455 : 470;
  const sw: DialPreset[] = [
    { id: "sw-49-31", label: "SW 5.9–9.9 MHz", band: { kind: "SW", lowKHz: 5900, highKHz: 9900, ifKHz: amIf } },
    { id: "sw-wide", label: "SW 5.9–18 MHz", band: { kind: "SW", lowKHz: 5900, highKHz: 18000, ifKHz: amIf } },
  ];
  const fm: DialPreset =
    region === 1
      ? { id: "fm", label: "FM 87.5–108 MHz", band: { kind: "FM", lowKHz: 87500, highKHz: 108000, ifKHz: 10700 } }
      : { id: "fm", label: "FM 88–108 MHz", band: { kind: "FM", lowKHz: 88000, highKHz: 108000, ifKHz: 10700 } };
  return [...lw, ...mw, ...sw, fm];
}
