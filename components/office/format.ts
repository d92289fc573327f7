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

/** One way to write a moment in the office: "2026-03-04 14:05 UTC". */
export function formatWhen(value: string | Date | null | undefined): string {
  if (!value) return "—";
  const d = typeof value === "string" ? new Date(value) : value;
  if (Number.isNaN(d.getTime())) return "—";
  return `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

export function formatDay(value: string | Date | null | undefined): string {
  if (!value) return "—";
  const d = typeof value === "string" ? new Date(value) : value;
  return Number.isNaN(d.getTime()) ? "—" : d.toISOString().slice(0, 10);
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
