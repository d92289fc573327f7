import { EngineError } from "../engine-error";

// The documents the shop issues about money. Each kind has its own series per calendar year at the shop,
// numbered 1, 2, 3, ... without gaps; the printed number carries the kind's prefix and the year, so
// "INV-2026-0007" is the seventh invoice of 2026. The counting is the server's (one counter row per series,
// taken FOR UPDATE in the issuing transaction); this file only names and reads the numbers.

export const MONEY_DOCUMENT_KINDS = ["receipt", "refund", "invoice"] as const;
export type MoneyDocumentKind = (typeof MONEY_DOCUMENT_KINDS)[number];

export const DOCUMENT_PREFIX: Record<MoneyDocumentKind, string> = {
  receipt: "RCT",
  refund: "RFD",
  invoice: "INV",
};

export const DOCUMENT_TITLE: Record<MoneyDocumentKind, string> = {
  receipt: "Receipt",
  refund: "Refund note",
  invoice: "Invoice",
};

/** A refund note's title by the refund's kind: a reduction of the price reads as such, not as a plain refund. */
export const REFUND_NOTE_TITLE: Record<"return" | "reduction", string> = {
  return: "Refund note",
  reduction: "Price reduction note",
};

/** Four digits at least, so a year's numbers sort as text; a busy year simply grows a fifth digit. */
const MIN_DIGITS = 4;

export function formatDocumentNumber(kind: MoneyDocumentKind, year: number, sequence: number): string {
  if (!Number.isInteger(year) || year < 2000 || year > 9999) throw new EngineError("bad-year", "Use a four-digit year.", "year");
  if (!Number.isSafeInteger(sequence) || sequence < 1) throw new EngineError("bad-sequence", "Use a whole number from 1.", "sequence");
  return `${DOCUMENT_PREFIX[kind]}-${year}-${String(sequence).padStart(MIN_DIGITS, "0")}`;
}

const NUMBER_PATTERN = /^([A-Z]{3})-(\d{4})-(\d{4,})$/;

/** Reads a printed number back; null for anything that is not one of ours. */
export function parseDocumentNumber(text: string): { kind: MoneyDocumentKind; year: number; sequence: number } | null {
  const m = NUMBER_PATTERN.exec(text.trim());
  if (!m) return null;
  const kind = MONEY_DOCUMENT_KINDS.find((k) => DOCUMENT_PREFIX[k] === m[1]);
  const sequence = Number(m[3]);
  if (!kind || sequence < 1 || (m[3]!.length > MIN_DIGITS && m[3]!.startsWith("0"))) return null;
  return { kind, year: Number(m[2]), sequence };
}

/** The series year of a document issued on a shop calendar day (YYYY-MM-DD, from dayInZone). */
export function seriesYear(shopDay: string): number {
  const year = Number(shopDay.slice(0, 4));
  if (!/^\d{4}-\d{2}-\d{2}$/.test(shopDay) || !Number.isInteger(year)) throw new EngineError("bad-day", "Use a day as YYYY-MM-DD.", "day");
  return year;
}

/**
 * The numbers missing from a series, given the sequences issued (any order): what an auditor asks first.
 * Empty when the series runs 1..n without a gap.
 */
export function seriesGaps(sequences: readonly number[]): number[] {
  const seen = new Set(sequences);
  const max = sequences.reduce((m, s) => Math.max(m, s), 0);
  const gaps: number[] = [];
  for (let n = 1; n <= max; n++) if (!seen.has(n)) gaps.push(n);
  return gaps;
}
