import { EngineError } from "../engine-error";
import { MAX_AMOUNT_MINOR } from "../shop-policy";

/**
 * The one rounding rule for money: a non-negative integer quotient rounded half up (0.5 minor unit goes
 * up). Every rate, markup and tax is applied by this function and nowhere else.
 */
export function roundHalfUpDiv(numerator: number, denominator: number): number {
  if (!Number.isSafeInteger(numerator) || !Number.isSafeInteger(denominator) || numerator < 0 || denominator <= 0) {
    throw new EngineError("money-arithmetic", "Money arithmetic needs non-negative whole numbers.");
  }
  return Math.floor((2 * numerator + denominator) / (2 * denominator));
}

/** Applies basis points (1 bp = 0.01 %) to an amount in minor units. */
export function applyBasisPoints(amountMinor: number, bp: number): number {
  return roundHalfUpDiv(amountMinor * bp, 10_000);
}

export function checkAmount(amountMinor: number, field = "amountMinor"): number {
  if (!Number.isSafeInteger(amountMinor) || amountMinor < 0) {
    throw new EngineError("amount-invalid", "Amounts are whole, non-negative numbers of minor units.", field);
  }
  if (amountMinor > MAX_AMOUNT_MINOR) {
    throw new EngineError("amount-too-large", "The amount is above what the payment processor accepts.", field);
  }
  return amountMinor;
}

/** Parses a decimal string ("12.34") into minor units without floating point: USD 12.34 → 1234. */
export function toMinor(decimal: string, exponent: number, field = "amount"): number {
  const m = /^(\d+)(?:\.(\d+))?$/.exec(decimal.trim());
  if (!m) throw new EngineError("amount-format", "Write the amount as digits with an optional decimal point.", field);
  const fraction = m[2] ?? "";
  if (fraction.length > exponent) {
    throw new EngineError("amount-precision", `This currency has ${exponent} decimal places.`, field);
  }
  const digits = m[1] + fraction.padEnd(exponent, "0");
  const value = Number(digits);
  return checkAmount(value, field);
}

/** "1234" → "12.34" for exponent 2; no locale, no symbol (the UI adds those). */
export function formatMinor(amountMinor: number, exponent: number): string {
  checkAmount(amountMinor);
  if (exponent === 0) return String(amountMinor);
  const s = String(amountMinor).padStart(exponent + 1, "0");
  return `${s.slice(0, -exponent)}.${s.slice(-exponent)}`;
}
