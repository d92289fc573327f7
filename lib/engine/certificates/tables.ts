import type { CertificateDocument, CertificateReading } from "./document";
import { bandName, formatNumber, readingKey } from "@/lib/engine/verdicts";

export const VERDICT_WORD: Record<CertificateReading["verdict"], string> = {
  pass: "Pass",
  fail: "Fail",
  missing: "Not measured",
  recorded: "Recorded",
};

/** Frequencies as people read them off a dial: kHz below 10 MHz, MHz above; other units as stored. */
export function formatFrequency(kHz: number): string {
  return kHz >= 10000 ? `${formatNumber(kHz / 1000, 4)} MHz` : `${formatNumber(kHz, 3)} kHz`;
}

export function formatReading(value: number | null, unit: string): string {
  if (value === null) return "not measured";
  if (unit === "kHz") return formatFrequency(value);
  return `${formatNumber(value, 3)} ${unit}`;
}

export type BandEdgeRow = {
  index: number;
  name: string;
  nominal: string;
  low: string;
  high: string;
  lowReading: CertificateReading | null;
  highReading: CertificateReading | null;
  /** The edges as the set came in, where they were measured (null otherwise). */
  lowAsReceived: string | null;
  highAsReceived: string | null;
  tolerance: string;
  verdict: string;
  passed: boolean | null;
};

const overall = (rs: (CertificateReading | null)[]): CertificateReading["verdict"] => {
  if (rs.some((r) => !r || r.verdict === "missing")) return "missing";
  return rs.some((r) => r!.verdict === "fail") ? "fail" : "pass";
};

/** One row per band: the printed dial range against the measured edges, with the tolerance and verdict. */
export function bandEdgeRows(d: Pick<CertificateDocument, "bands" | "readings">): BandEdgeRow[] {
  const byKey = new Map(d.readings.map((r) => [r.key, r]));
  return d.bands.map((b) => {
    const low = byKey.get(readingKey.edgeLow(b.index)) ?? null;
    const high = byKey.get(readingKey.edgeHigh(b.index)) ?? null;
    const v = overall([low, high]);
    const tolerances = [...new Set([low?.toleranceText, high?.toleranceText].filter((t): t is string => Boolean(t)))];
    return {
      index: b.index,
      name: bandName(b, b.index),
      nominal: `${formatFrequency(b.lowKHz)} – ${formatFrequency(b.highKHz)}`,
      low: formatReading(low?.value ?? null, "kHz"),
      high: formatReading(high?.value ?? null, "kHz"),
      lowReading: low,
      highReading: high,
      lowAsReceived: low?.asReceived ? formatReading(low.asReceived.value, "kHz") : null,
      highAsReceived: high?.asReceived ? formatReading(high.asReceived.value, "kHz") : null,
      tolerance: tolerances.join("; ") || "—",
      verdict: VERDICT_WORD[v],
      passed: v === "missing" ? null : v === "pass",
    };
  });
}

/** Everything that is not a band edge: IF peaks, dial calibration at the tracking points (received and LO), leakage (with its limit), B+ and the mains at the time. */
export function otherReadings(d: Pick<CertificateDocument, "readings">): CertificateReading[] {
  return d.readings.filter((r) => !/^band\.\d+\.edge\.(low|high)$/.test(r.key));
}
