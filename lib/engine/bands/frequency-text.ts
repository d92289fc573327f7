export type FrequencyUnit = "kHz" | "MHz";

const UNIT_FACTOR: Record<string, number> = { hz: 1e-3, k: 1, khz: 1, m: 1000, mhz: 1000 };

/**
 * A frequency as a person types it, in kHz: "455", "455 kHz", "455k", "1.49 MHz", "10.7M", "1,003.5".
 * A bare number is in `unit` (kHz unless the field says MHz). "" gives null; anything else that is not
 * a number with an optional unit gives undefined. Signs are kept, so the caller can refuse them by name.
 */
export function parseFrequencyText(text: string, unit: FrequencyUnit = "kHz"): number | null | undefined {
  const s = text.trim().replace(/,/g, "");
  if (s === "") return null;
  const m = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+))\s*(hz|khz|k|mhz|m)?$/i.exec(s);
  if (!m) return undefined;
  const factor = m[2] ? UNIT_FACTOR[m[2].toLowerCase()]! : unit === "MHz" ? 1000 : 1;
  // Round away binary noise from the unit change (1.49 × 1000 = 1490.0000000000002).
  return Number((Number(m[1]) * factor).toPrecision(12));
}
