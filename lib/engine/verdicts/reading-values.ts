import { formatNumber, type ReadingRequirement, type ReadingUnit } from "./judge-reading";

/**
 * Readings are physical: a frequency, a current or a voltage below zero is bad input, and so is a
 * frequency in the wrong unit (0.58 typed in a kHz field for the 580 kHz mark). A reading that is merely
 * out of tolerance is a fail, not bad input; a reading off by more than these factors is not a reading
 * of that mark at all.
 */
const FREQUENCY_FACTOR = 2;
const LIMITS: Record<Exclude<ReadingUnit, "kHz">, { max: number; what: string }> = {
  mA: { max: 1000, what: "A current" },
  V: { max: 1000, what: "A voltage" },
  // The performance readings: a generator input up to 1 V, ratios up to 150 dB, up to 100 W of audio.
  µV: { max: 1_000_000, what: "An input level" },
  dB: { max: 150, what: "A ratio in dB" },
  mW: { max: 100_000, what: "An output power" },
  mV: { max: 10_000, what: "A voltage" },
  scale: { max: 1000, what: "A tester reading" },
};

const fmtKHz = (kHz: number) => (kHz >= 10000 ? `${formatNumber(kHz / 1000)} MHz` : `${formatNumber(kHz)} kHz`);

/** null when the value can be a reading of this requirement; otherwise the message for the value field. */
export function readingValueProblem(
  r: Pick<ReadingRequirement, "unit" | "nominal" | "entryUnit" | "measures">,
  value: number,
): string | null {
  if (!Number.isFinite(value)) return "Enter a number.";
  if (r.unit === "kHz") {
    if (value <= 0) return "A frequency is above zero.";
    if (r.nominal !== null && r.nominal > 0 && (value < r.nominal / FREQUENCY_FACTOR || value > r.nominal * FREQUENCY_FACTOR)) {
      const typedUnit = r.entryUnit ?? "kHz";
      const hint =
        value < r.nominal / FREQUENCY_FACTOR && typedUnit === "kHz"
          ? ` If you meant ${formatNumber(value)} MHz, type "${formatNumber(value)} MHz".`
          : value > r.nominal * FREQUENCY_FACTOR && typedUnit === "MHz"
            ? ` This field takes MHz; type "${formatNumber(value / 1000)} kHz" for kHz.`
            : "";
      return `${fmtKHz(value)} is no reading of the ${fmtKHz(r.nominal)} point: check the unit.${hint}`;
    }
    return null;
  }
  const limit = LIMITS[r.unit];
  if (value < 0) return `${limit.what} reading is not below zero.`;
  if (r.unit === "µV" && value === 0) return "An input level is above zero µV.";
  if (value > limit.max) return `${limit.what} above ${limit.max} ${r.unit} is no reading of this set: check the unit.`;
  if (r.measures === "mains" && (value < 50 || value > 300)) return "Mains voltage lies between 50 and 300 V.";
  return null;
}
