import { z } from "../zod";
import { EngineError } from "../engine-error";

/** One point of an IF response: offset from the nominal IF in kHz, response in dB relative to any reference. */
export type PassbandPoint = { offsetKHz: number; db: number };
/** One point of an FM discriminator curve: offset from the nominal IF in kHz, DC output in volts. */
export type DiscriminatorPoint = { offsetKHz: number; volts: number };

export const passbandPointSchema = z.object({
  offsetKHz: z.number({ error: "Offset: enter a number of kHz." }).finite().min(-1000).max(1000),
  db: z.number({ error: "Response: enter a number of dB." }).finite().min(-150).max(150),
});
export const discriminatorPointSchema = z.object({
  offsetKHz: z.number({ error: "Offset: enter a number of kHz." }).finite().min(-1000).max(1000),
  volts: z.number({ error: "Output: enter a number of volts." }).finite().min(-1000).max(1000),
});

export type PassbandEdges = { lowerKHz: number | null; upperKHz: number | null; widthKHz: number | null; symmetryKHz: number | null };

export type PassbandResult = {
  /** Offset of the interpolated peak from the nominal IF, kHz, and its level in the points' own dB. */
  peakOffsetKHz: number;
  peakDb: number;
  /** Midway between the −3 dB edges, when both are inside the sweep. */
  centreKHz: number | null;
  /**
   * Edges, width and symmetry at 3 and 6 dB below the peak. Symmetry is the upper half-width less the lower
   * one, measured from the peak: positive means the response reaches further above the peak than below it.
   */
  db3: PassbandEdges;
  db6: PassbandEdges;
  /** What the sweep did not show (an edge beyond its end, the peak at its end), in words for the sheet. */
  notes: string[];
};

function sortedPoints<T extends { offsetKHz: number }>(points: readonly T[], min: number, field: string): T[] {
  if (!Array.isArray(points) || points.length < min) {
    throw new EngineError("too-few-points", `Give at least ${min} points across the passband.`, field);
  }
  const sorted = [...points].sort((a, b) => a.offsetKHz - b.offsetKHz);
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i]!.offsetKHz === sorted[i - 1]!.offsetKHz) {
      throw new EngineError("duplicate-offset", `Two points at ${sorted[i]!.offsetKHz} kHz: give each offset once.`, field);
    }
  }
  return sorted;
}

/** Where the straight line through (x0, y0) and (x1, y1) reaches y. */
function crossAt(x0: number, y0: number, x1: number, y1: number, y: number): number {
  return y1 === y0 ? x0 : x0 + ((y - y0) * (x1 - x0)) / (y1 - y0);
}

/** The vertex of the parabola through three points (any spacing), kept between the outer two. */
function parabolicPeak(a: PassbandPoint, b: PassbandPoint, c: PassbandPoint): { x: number; y: number } {
  const d1 = (b.db - a.db) / (b.offsetKHz - a.offsetKHz);
  const d2 = (c.db - b.db) / (c.offsetKHz - b.offsetKHz);
  const curvature = (d2 - d1) / (c.offsetKHz - a.offsetKHz);
  if (!(curvature < 0)) return { x: b.offsetKHz, y: b.db };
  // y = b + d1·(x − a) + curvature·(x − a)(x − b): its derivative is zero at x*.
  const x = (a.offsetKHz + b.offsetKHz) / 2 - d1 / (2 * curvature);
  const clamped = Math.min(Math.max(x, a.offsetKHz), c.offsetKHz);
  const y = a.db + d1 * (clamped - a.offsetKHz) + curvature * (clamped - a.offsetKHz) * (clamped - b.offsetKHz);
  return { x: clamped, y: Math.max(y, b.db) };
}

function edgesAt(points: PassbandPoint[], peakIndex: number, peak: { x: number; y: number }, drop: number): PassbandEdges {
  const level = peak.y - drop;
  let upper: number | null = null;
  for (let j = peakIndex + 1; j < points.length; j++) {
    if (points[j]!.db <= level) {
      const p = points[j - 1]!;
      const q = points[j]!;
      upper = crossAt(p.offsetKHz, p.db, q.offsetKHz, q.db, level);
      break;
    }
  }
  let lower: number | null = null;
  for (let j = peakIndex - 1; j >= 0; j--) {
    if (points[j]!.db <= level) {
      const p = points[j]!;
      const q = points[j + 1]!;
      lower = crossAt(p.offsetKHz, p.db, q.offsetKHz, q.db, level);
      break;
    }
  }
  const width = lower !== null && upper !== null ? upper - lower : null;
  const symmetry = lower !== null && upper !== null ? upper - peak.x - (peak.x - lower) : null;
  return { lowerKHz: lower, upperKHz: upper, widthKHz: width, symmetryKHz: symmetry };
}

/**
 * The IF passband from relative response readings, swept or taken point by point with a generator: the
 * peak by parabolic interpolation through the highest point and its neighbours, the −3 dB and −6 dB edges by
 * linear interpolation between the points either side, the widths between them and the symmetry. Only the
 * shape counts: adding the same number of dB to every point changes nothing but the peak level.
 */
export function analysePassband(input: readonly PassbandPoint[]): PassbandResult {
  const points = sortedPoints(input, 3, "points");
  points.forEach((p, i) => {
    if (!Number.isFinite(p.offsetKHz) || !Number.isFinite(p.db)) {
      throw new EngineError("not-finite", `Point ${i + 1}: the offset and the response must be numbers.`, `points.${i}`);
    }
  });
  let top = 0;
  points.forEach((p, i) => {
    if (p.db > points[top]!.db) top = i;
  });
  const notes: string[] = [];
  const atEnd = top === 0 || top === points.length - 1;
  const peak = atEnd ? { x: points[top]!.offsetKHz, y: points[top]!.db } : parabolicPeak(points[top - 1]!, points[top]!, points[top + 1]!);
  if (atEnd) notes.push(`The highest point is at the ${top === 0 ? "low" : "high"} end of the sweep: sweep further that way.`);
  const db3 = edgesAt(points, top, peak, 3);
  const db6 = edgesAt(points, top, peak, 6);
  for (const [name, e] of [
    ["3 dB", db3],
    ["6 dB", db6],
  ] as const) {
    if (e.lowerKHz === null) notes.push(`The response does not fall ${name} below the peak on the low side within the sweep.`);
    if (e.upperKHz === null) notes.push(`The response does not fall ${name} below the peak on the high side within the sweep.`);
  }
  const centre = db3.lowerKHz !== null && db3.upperKHz !== null ? (db3.lowerKHz + db3.upperKHz) / 2 : null;
  return { peakOffsetKHz: peak.x, peakDb: peak.y, centreKHz: centre, db3, db6, notes };
}

export type DiscriminatorResult = {
  /** Offset where the output crosses zero, kHz from the nominal IF, by linear interpolation. */
  zeroCrossingKHz: number;
  /** Slope of the curve through the crossing, V per kHz. */
  centreSlopeVPerKHz: number;
  /** The span around the crossing over which the slope stays within `linearityPercent` of the centre slope. */
  linearLowKHz: number;
  linearHighKHz: number;
  linearWidthKHz: number;
  linearityPercent: number;
  notes: string[];
};

/** Linearity limit when none is stated: the slope within ±10 % of the centre slope (the shop's choice). */
export const DEFAULT_LINEARITY_PERCENT = 10;

/**
 * An FM discriminator's S-curve from DC output readings at offsets around the IF: the zero crossing nearest
 * the nominal IF, by linear interpolation; the centre slope, that of the segment through the crossing; and
 * the linear range, the run of segments on either side whose slope stays within the stated percentage of
 * the centre slope.
 */
export function analyseDiscriminator(
  input: readonly DiscriminatorPoint[],
  linearityPercent = DEFAULT_LINEARITY_PERCENT,
): DiscriminatorResult {
  const points = sortedPoints(input, 3, "points");
  if (!(linearityPercent > 0 && linearityPercent <= 100)) {
    throw new EngineError("out-of-range", "The linearity limit lies between 0 and 100 %.", "linearityPercent");
  }
  let crossing: { x: number; segment: number } | null = null;
  for (let i = 0; i + 1 < points.length; i++) {
    const p = points[i]!;
    const q = points[i + 1]!;
    if ((p.volts <= 0 && q.volts >= 0) || (p.volts >= 0 && q.volts <= 0)) {
      if (p.volts === q.volts) continue;
      const x = crossAt(p.offsetKHz, p.volts, q.offsetKHz, q.volts, 0);
      if (!crossing || Math.abs(x) < Math.abs(crossing.x)) crossing = { x, segment: i };
    }
  }
  if (!crossing) throw new EngineError("no-crossing", "The output never crosses zero: sweep across the IF on both sides.", "points");
  const slope = (i: number) => (points[i + 1]!.volts - points[i]!.volts) / (points[i + 1]!.offsetKHz - points[i]!.offsetKHz);
  const centreSlope = slope(crossing.segment);
  const within = (i: number) => Math.abs(slope(i) - centreSlope) <= (linearityPercent / 100) * Math.abs(centreSlope);
  let lo = crossing.segment;
  while (lo - 1 >= 0 && within(lo - 1)) lo--;
  let hi = crossing.segment;
  while (hi + 1 < points.length - 1 && within(hi + 1)) hi++;
  const notes: string[] = [];
  if (lo === 0) notes.push("The curve is still straight at the low end of the readings: the linear range may be wider.");
  if (hi === points.length - 2) notes.push("The curve is still straight at the high end of the readings: the linear range may be wider.");
  const low = points[lo]!.offsetKHz;
  const high = points[hi + 1]!.offsetKHz;
  return {
    zeroCrossingKHz: crossing.x,
    centreSlopeVPerKHz: centreSlope,
    linearLowKHz: low,
    linearHighKHz: high,
    linearWidthKHz: high - low,
    linearityPercent,
    notes,
  };
}
