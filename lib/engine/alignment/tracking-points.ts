import type { DialRange } from "./inputs";

/** Round to a step a technician can set on a generator: about 1/50 of the span, as a power of ten. */
export function niceStepKHz(band: DialRange): number {
  const span = band.highKHz - band.lowKHz;
  return 10 ** Math.floor(Math.log10(span / 50));
}

/**
 * Rule-of-thumb tracking points: the outer two at the Chebyshev nodes of the band on a logarithmic
 * frequency scale (roughly where the dial ends bunch up), the middle at their geometric mean. On a
 * 540–1600 kHz dial this gives the familiar "about 600, 1000 and 1400–1500 kHz". The band is one that
 * has passed a check (a request's door or the set-profile schema).
 */
export function ruleOfThumbPoints(band: DialRange): [number, number, number] {
  const a = Math.log(band.lowKHz);
  const b = Math.log(band.highKHz);
  const mid = (a + b) / 2;
  const half = ((b - a) / 2) * Math.cos(Math.PI / 6);
  const step = niceStepKHz(band);
  const snap = (f: number) => Math.min(Math.max(Math.round(f / step) * step, band.lowKHz), band.highKHz);
  const low = snap(Math.exp(mid - half));
  const high = snap(Math.exp(mid + half));
  const middle = snap(Math.sqrt(low * high));
  return [low, middle, high];
}

export function geometricMean(a: number, b: number): number {
  return Math.sqrt(a * b);
}
