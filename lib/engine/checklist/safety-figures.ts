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
