import { EngineError } from "../engine-error";
import { bandKindForRange, plausibleBandRangeKHz, type BandKind, type Injection } from "../bands/band";
import { ifFamilyForBand, ifFamilyOf, plausibleIfRangeKHz, type IfFamily } from "../bands/if-presets";

export type { Injection };
export type DialRange = { lowKHz: number; highKHz: number };
export type Gang = { minPF: number; maxPF: number; strayPF?: number };

export const MIN_DIAL_KHZ = 30;
export const MAX_DIAL_KHZ = 1_000_000;
export const MAX_DIAL_RATIO = 20;

declare const checkedMark: unique symbol;
/** A value that has been through the engine's door: the computations trust it and check nothing again. */
type Checked<T, Tag extends string> = T & { readonly [checkedMark]: Tag };

/** A dial range that is in order, physical, and knows its kind (stated, or read from its frequencies). */
export type CheckedBand = Checked<DialRange & { kind: BandKind }, "band">;
/** An IF of a known family, matching the band's. */
export type CheckedIf = Checked<{ kHz: number; family: IfFamily }, "if">;
export type CheckedGang = Checked<Required<Gang>, "gang">;

/**
 * Everything one band's alignment is computed from, checked once. Build it with checkAlignmentBasis
 * (or the request parser in lib/engine/requests); the LO stays above zero across the band.
 */
export type AlignmentBasis = Checked<{ band: CheckedBand; ifKHz: number; ifFamily: IfFamily; injection: Injection }, "basis">;
export type TrackingBasis = AlignmentBasis & { gang: CheckedGang };

const isNum = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);

function refuse(code: string, message: string, field: string): never {
  throw new EngineError(code, message, field);
}

/** The band as printed on the dial; its kind is the one stated, or the one its frequencies belong to. */
export function checkBand(band: DialRange & { kind?: BandKind }, prefix = "band"): CheckedBand {
  if (!isNum(band.lowKHz) || band.lowKHz <= 0)
    refuse("not-positive", "The low end of the band must be a frequency above zero.", `${prefix}.lowKHz`);
  if (!isNum(band.highKHz) || band.highKHz <= 0)
    refuse("not-positive", "The high end of the band must be a frequency above zero.", `${prefix}.highKHz`);
  if (band.lowKHz >= band.highKHz) refuse("band-order", "The high end must be above the low end.", `${prefix}.highKHz`);
  // No receiver dial starts below LF or spans more than this; beyond it the figures are typing errors.
  if (band.lowKHz < MIN_DIAL_KHZ) {
    refuse(
      "band-absurd",
      `A dial starts at ${MIN_DIAL_KHZ} kHz or above; for ${band.lowKHz} MHz type "${band.lowKHz} MHz".`,
      `${prefix}.lowKHz`,
    );
  }
  if (band.highKHz > MAX_DIAL_KHZ) refuse("band-absurd", `A dial ends at ${MAX_DIAL_KHZ} kHz or below.`, `${prefix}.highKHz`);
  if (band.highKHz / band.lowKHz > MAX_DIAL_RATIO) {
    refuse("band-absurd", `A single band spans at most ${MAX_DIAL_RATIO}:1 in frequency.`, `${prefix}.highKHz`);
  }
  const kind = band.kind ?? bandKindForRange(band);
  if (band.kind) {
    const r = plausibleBandRangeKHz[kind];
    if (band.lowKHz < r.min || band.highKHz > r.max) {
      refuse(
        "band-kind",
        `A ${kind} dial lies between ${r.min} and ${r.max} kHz; this range belongs to another band kind.`,
        `${prefix}.kind`,
      );
    }
  }
  return { lowKHz: band.lowKHz, highKHz: band.highKHz, kind } as CheckedBand;
}

/** An IF of a known family (AM 455-class or FM 10.7 MHz-class); anything else is a typing error. */
export function checkIf(ifKHz: number, field = "ifKHz"): CheckedIf {
  if (!isNum(ifKHz) || ifKHz <= 0) refuse("not-positive", "The IF must be a frequency above zero.", field);
  const family = ifFamilyOf(ifKHz);
  const { AM, FM } = plausibleIfRangeKHz;
  if (family === null) refuse("if-out-of-range", `The IF lies in ${AM.min}–${AM.max} kHz (AM) or ${FM.min}–${FM.max} kHz (FM).`, field);
  return { kHz: ifKHz, family } as CheckedIf;
}

/** The IF must be of the band's family: an AM IF for LW, MW and SW, 10.7 MHz-class for FM. */
export function checkIfForBand(ifKHz: number, band: CheckedBand, field = "ifKHz"): CheckedIf {
  const checked = checkIf(ifKHz, field);
  const wanted = ifFamilyForBand(band.kind);
  if (checked.family !== wanted) {
    const r = plausibleIfRangeKHz[wanted];
    refuse(
      "if-family",
      `A ${band.kind} band needs an ${wanted} IF (${r.min}–${r.max} kHz); ${ifKHz} kHz is an ${checked.family} IF.`,
      field,
    );
  }
  return checked;
}

/** Joins a checked band and IF with the oscillator side: with the LO below the signal it must stay above zero. */
export function alignmentBasis(band: CheckedBand, ifv: CheckedIf, injection: Injection = "high"): AlignmentBasis {
  if (injection !== "high" && injection !== "low") refuse("injection", 'Injection must be "high" or "low".', "injection");
  if (injection === "low" && band.lowKHz <= ifv.kHz) {
    refuse("lo-below-zero", "With low-side injection the low end of the band must be above the IF.", "band.lowKHz");
  }
  return { band, ifKHz: ifv.kHz, ifFamily: ifv.family, injection } as AlignmentBasis;
}

export function checkGang(gang: Gang, prefix = "gang"): CheckedGang {
  const strayPF = gang.strayPF ?? 0;
  if (!isNum(gang.minPF)) refuse("not-finite", "The gang minimum must be a finite number.", `${prefix}.minPF`);
  if (!isNum(gang.maxPF) || gang.maxPF <= 0) refuse("not-positive", "The gang maximum must be greater than zero.", `${prefix}.maxPF`);
  if (!isNum(strayPF)) refuse("not-finite", "The stray capacitance must be a finite number.", `${prefix}.strayPF`);
  if (gang.minPF < 0) refuse("negative", "The gang minimum cannot be negative.", `${prefix}.minPF`);
  if (strayPF < 0) refuse("negative", "The stray capacitance cannot be negative.", `${prefix}.strayPF`);
  if (gang.maxPF <= gang.minPF) refuse("gang-order", "The gang maximum must be above its minimum.", `${prefix}.maxPF`);
  return { minPF: gang.minPF, maxPF: gang.maxPF, strayPF } as CheckedGang;
}

export type AlignmentBasisInput = { band: DialRange & { kind?: BandKind }; ifKHz: number; injection?: Injection };

/** The engine's one check of a band, its IF and the side of the oscillator. */
export function checkAlignmentBasis(input: AlignmentBasisInput): AlignmentBasis {
  const band = checkBand(input.band);
  return alignmentBasis(band, checkIfForBand(input.ifKHz, band), input.injection);
}

/** checkAlignmentBasis plus the gang, for the tracking designs. */
export function checkTrackingBasis(input: AlignmentBasisInput & { gang: Gang }): TrackingBasis {
  return { ...checkAlignmentBasis(input), gang: checkGang(input.gang) } as TrackingBasis;
}

/** Tracking points as given: finite, on the band, distinct; returned low to high. */
export function checkTrackingPoints(points: readonly number[], band: DialRange, count = 3, field = "trackingPointsKHz"): number[] {
  if (points.length !== count) refuse("points-count", `Give exactly ${count} tracking points.`, field);
  points.forEach((p, i) => {
    if (!isNum(p)) refuse("not-finite", "Each tracking point must be a finite number.", `${field}.${i}`);
    if (p < band.lowKHz || p > band.highKHz) refuse("point-outside-band", "Tracking points must lie on the band.", `${field}.${i}`);
  });
  const sorted = [...points].sort((a, b) => a - b);
  const minGap = (band.highKHz - band.lowKHz) * 1e-3;
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i] - sorted[i - 1] < minGap)
      refuse("points-too-close", "Tracking points must be distinct and spread across the band.", field);
  }
  return sorted;
}
