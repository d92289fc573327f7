import { EngineError } from "../engine-error";

/**
 * Signal levels as a bench reads them off a generator or a meter. Every conversion follows the definition:
 * dBµV is 20·log10 of the voltage over 1 µV; dBm is 10·log10 of the power over 1 mW, so a level in dBm is a
 * voltage only for a stated resistance (V = √(P·R)); a power into a stated load is V²/R. Voltages are rms.
 */

/** The generator's usual source and load resistance, ohms. */
export const GENERATOR_OHMS = 50;

function positive(value: number, field: string, what: string): number {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new EngineError("not-positive", `${what} must be a number above zero.`, field);
  }
  return value;
}

function finite(value: number, field: string, what: string): number {
  if (typeof value !== "number" || !Number.isFinite(value)) throw new EngineError("not-finite", `${what} must be a number.`, field);
  return value;
}

export function microvoltsToDbuv(microvolts: number): number {
  return 20 * Math.log10(positive(microvolts, "microvolts", "A voltage in µV"));
}

export function dbuvToMicrovolts(dbuv: number): number {
  return 10 ** (finite(dbuv, "dbuv", "A level in dBµV") / 20);
}

/** A power in dBm into `ohms` (50 Ω unless stated) as the rms voltage across it, µV. */
export function dbmToMicrovolts(dbm: number, ohms = GENERATOR_OHMS): number {
  const watts = 1e-3 * 10 ** (finite(dbm, "dbm", "A level in dBm") / 10);
  return Math.sqrt(watts * positive(ohms, "ohms", "The resistance")) * 1e6;
}

export function microvoltsToDbm(microvolts: number, ohms = GENERATOR_OHMS): number {
  const volts = positive(microvolts, "microvolts", "A voltage in µV") * 1e-6;
  return 10 * Math.log10((volts * volts) / positive(ohms, "ohms", "The resistance") / 1e-3);
}

/** The rms voltage that puts `milliwatts` into a load of `ohms`, V. */
export function milliwattsToVolts(milliwatts: number, ohms: number): number {
  const mw = finite(milliwatts, "milliwatts", "A power in mW");
  if (mw < 0) throw new EngineError("negative", "A power in mW is not below zero.", "milliwatts");
  return Math.sqrt((mw / 1000) * positive(ohms, "ohms", "The load"));
}

/** The power an rms voltage puts into a load of `ohms`, mW. */
export function voltsToMilliwatts(volts: number, ohms: number): number {
  const v = finite(volts, "volts", "A voltage");
  return ((v * v) / positive(ohms, "ohms", "The load")) * 1000;
}

export type SignalUnit = "µV" | "dBµV" | "dBm";

/** A generator level in any of the bench's units, as µV (dBm into 50 Ω). */
export function toMicrovolts(value: number, unit: SignalUnit): number {
  if (unit === "µV") return positive(value, "value", "A voltage in µV");
  if (unit === "dBµV") return dbuvToMicrovolts(value);
  return dbmToMicrovolts(value);
}

export type OutputUnit = "mW" | "V";

/** An output reading, as a power or as the rms voltage across the stated load, in mW. */
export function toMilliwatts(value: number, unit: OutputUnit, loadOhms: number): number {
  return unit === "mW" ? value : voltsToMilliwatts(value, loadOhms);
}
