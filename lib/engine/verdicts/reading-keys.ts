/**
 * Reading keys: the names under which the bench sheet stores each measurement. They are stable,
 * because stored readings and signed certificates refer to them.
 *
 *   if.peak.<ifKHz>        frequency at which the IF peaks, kHz            (line align.if.<ifKHz>)
 *   band.<i>.edge.low      received frequency with the pointer at the low end mark, kHz   (align.dial.<i>)
 *   band.<i>.edge.high     received frequency with the pointer at the high end mark, kHz  (align.dial.<i>)
 *   band.<i>.lo.low        LO frequency at the low tracking point's mark, kHz (align.tracking.<i>)
 *   band.<i>.lo.high       LO frequency at the high tracking point's mark, kHz (align.tracking.<i>)
 *   band.<i>.track.<k>     received frequency at tracking point k = 0, 1, 2 (low to high), kHz (align.tracking.<i>)
 *
 * Every band reading checks dial calibration (where the set receives against where the dial points), read
 * either as the received frequency or as the LO; tracking proper is the antenna circuit's peak.
 *   leakage.plug-a         leakage current, plug one way, mA               (test.leakage)
 *   leakage.plug-b         leakage current, plug reversed, mA              (test.leakage)
 *   bplus                  B+ at the filter output, V                      (test.voltages)
 *   bplus.mains            mains voltage while B+ was read, V              (test.voltages)
 *
 * <i> is the band's zero-based index in the set profile; <ifKHz> is the IF as a plain decimal number
 * (455, 10700).
 */
export const readingKey = {
  ifPeak: (ifKHz: number) => `if.peak.${ifKHz}`,
  edgeLow: (band: number) => `band.${band}.edge.low`,
  edgeHigh: (band: number) => `band.${band}.edge.high`,
  loLow: (band: number) => `band.${band}.lo.low`,
  loHigh: (band: number) => `band.${band}.lo.high`,
  track: (band: number, point: number) => `band.${band}.track.${point}`,
  leakagePlugA: "leakage.plug-a",
  leakagePlugB: "leakage.plug-b",
  bPlus: "bplus",
  bPlusMains: "bplus.mains",
} as const;

export type ParsedReadingKey =
  | { kind: "if-peak"; ifKHz: number }
  | { kind: "edge"; band: number; end: "low" | "high" }
  | { kind: "lo"; band: number; end: "low" | "high" }
  | { kind: "track"; band: number; point: number }
  | { kind: "leakage"; plug: "a" | "b" }
  | { kind: "bplus" }
  | { kind: "bplus-mains" };

export function parseReadingKey(key: string): ParsedReadingKey | null {
  let m = /^if\.peak\.(\d+(?:\.\d+)?)$/.exec(key);
  if (m) return { kind: "if-peak", ifKHz: Number(m[1]) };
  m = /^band\.(\d+)\.(edge|lo)\.(low|high)$/.exec(key);
  if (m) return { kind: m[2] === "edge" ? "edge" : "lo", band: Number(m[1]), end: m[3] === "low" ? "low" : "high" };
  m = /^band\.(\d+)\.track\.([0-2])$/.exec(key);
  if (m) return { kind: "track", band: Number(m[1]), point: Number(m[2]) };
  m = /^leakage\.plug-(a|b)$/.exec(key);
  if (m) return { kind: "leakage", plug: m[1] === "a" ? "a" : "b" };
  if (key === "bplus") return { kind: "bplus" };
  if (key === "bplus.mains") return { kind: "bplus-mains" };
  return null;
}
