import { requireFinite, requirePositive } from "../engine-error";

/** Current through a capacitor across the mains, I = 2πfCV, in mA for C in nF. */
export function capacitorCurrentMA(capacitanceNF: number, volts: number, hertz: number): number {
  requirePositive(capacitanceNF, "capacitanceNF", "Capacitance");
  requirePositive(volts, "volts", "Voltage");
  requirePositive(hertz, "hertz", "Frequency");
  return 2 * Math.PI * hertz * capacitanceNF * 1e-9 * volts * 1e3;
}

/** Peak of a sine of the given rms voltage: what a filter capacitor charges to through a half-wave rectifier. */
export function peakVolts(rmsVolts: number): number {
  requirePositive(rmsVolts, "rmsVolts", "Voltage");
  return rmsVolts * Math.SQRT2;
}

/** RC time constant in seconds for µF and kΩ; five of them bring a charge down below 1 %. */
export function timeConstantSeconds(capacitanceUF: number, resistanceKOhm: number): number {
  requirePositive(capacitanceUF, "capacitanceUF", "Capacitance");
  requirePositive(resistanceKOhm, "resistanceKOhm", "Resistance");
  return capacitanceUF * 1e-6 * resistanceKOhm * 1e3;
}

/** Voltage across the 1.5 kΩ leakage network for a given current, as the service hot check reads it. */
export function leakageNetworkVolts(currentMA: number, networkKOhm = 1.5): number {
  requireFinite(currentMA, "currentMA", "Current");
  return currentMA * networkKOhm;
}

/**
 * What the filter capacitors of a tube set charge to, for the discharge caution. An AC/DC set rectifies
 * the mains directly, so they sit near its peak; a transformer set's sit at the peak of the high-voltage
 * winding, commonly 250–450 V (common practice), so the schematic's B+ is used when the profile has it.
 */
export function filterChargeText(profile: {
  kind: "tube-acdc" | "tube-transformer" | "transistor-battery" | "transistor-mains";
  mainsVolts?: number;
  bPlusVolts?: number;
}): string {
  const b = profile.bPlusVolts;
  if (profile.kind === "tube-acdc") {
    const volts = profile.mainsVolts ?? 120;
    const peak = Math.round(peakVolts(volts));
    return b === undefined
      ? `a ${volts} V supply charges them to about ${peak} V, the peak of the mains`
      : `about ${b} V, the set's B+ from the schematic, and up to about ${peak} V, the peak of the ${volts} V mains, with the tubes cold`;
  }
  return b === undefined
    ? "on a transformer set they charge to the peak of the high-voltage winding, commonly 250–450 V; the schematic gives the set's B+"
    : `about ${b} V, the set's B+ from the schematic, and more with the tubes cold or removed: up to the peak of the high-voltage winding`;
}
