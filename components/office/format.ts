import { formatDate, formatDateTime } from "@/lib/engine/dates";
import { formatMinor } from "@/lib/engine/pricing/money";

export type Currency = { code: string; exponent: number };

/** "USD 1,234.50" — integer minor units to text, no floating point; negative amounts keep their sign. */
export function formatMoney(amountMinor: number, currency: Currency): string {
  const sign = amountMinor < 0 ? "−" : "";
  const [whole, fraction] = formatMinor(Math.abs(amountMinor), currency.exponent).split(".");
  const grouped = (whole ?? "0").replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return `${sign}${currency.code} ${grouped}${fraction ? `.${fraction}` : ""}`;
}

/** Major-unit text for a form field ("12.34"), never grouped. */
export function majorUnits(amountMinor: number, currency: Currency): string {
  return formatMinor(Math.max(amountMinor, 0), currency.exponent);
}

/** One way to write a moment for staff, in the shop's zone: "2 Dec 2026, 14:05". */
export function formatWhen(value: string | Date | null | undefined, timeZone: string): string {
  return formatDateTime(value, { timeZone, style: "compact" });
}

/** The day of a moment for staff, in the shop's zone: "2 Dec 2026". */
export function formatDay(value: string | Date | null | undefined, timeZone: string): string {
  return formatDate(value, { timeZone, style: "compact" });
}

export type Jsonify<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Jsonify<U>[]
    : T extends object
      ? { [K in keyof T]: Jsonify<T[K]> }
      : T;

/** What a value looks like after a trip through JSON (dates become ISO strings), for initial query data. */
export function jsonify<T>(value: T): Jsonify<T> {
  return JSON.parse(JSON.stringify(value)) as Jsonify<T>;
}
