import { EngineError } from "../engine-error";

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const DAY_MS = 86_400_000;

/** Days since 1970-01-01 for an ISO calendar date; dates are shop-local calendar days, not instants. */
export function dayNumber(isoDate: string, field = "date"): number {
  const m = ISO_DATE.exec(isoDate);
  if (!m) throw new EngineError("date-format", "Dates are written YYYY-MM-DD.", field);
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const ms = Date.UTC(y, mo - 1, d);
  const back = new Date(ms);
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) {
    throw new EngineError("date-invalid", "That date does not exist.", field);
  }
  return ms / DAY_MS;
}

export function isoFromDayNumber(day: number): string {
  return new Date(day * DAY_MS).toISOString().slice(0, 10);
}

export function addDays(isoDate: string, days: number, field = "date"): string {
  if (!Number.isSafeInteger(days)) throw new EngineError("not-whole", "Days must be a whole number.", "days");
  return isoFromDayNumber(dayNumber(isoDate, field) + days);
}

export type WarrantyTerm = { startsOn: string; endsOn: string; termDays: number };

/**
 * The term starts on the completion (return) day and runs termDays calendar days including that day:
 * a 90-day term starting 2025-03-01 ends on 2025-05-29.
 */
export function computeWarrantyTerm(completedOn: string, termDays: number): WarrantyTerm {
  if (!Number.isSafeInteger(termDays) || termDays < 0) {
    throw new EngineError("not-whole", "The warranty term is a whole number of days.", "termDays");
  }
  const start = dayNumber(completedOn, "completedOn");
  return { startsOn: completedOn, endsOn: isoFromDayNumber(start + Math.max(termDays - 1, 0)), termDays };
}

export function isWithinTerm(term: WarrantyTerm, onDate: string): boolean {
  if (term.termDays === 0) return false;
  const d = dayNumber(onDate, "reportedOn");
  return d >= dayNumber(term.startsOn, "startsOn") && d <= dayNumber(term.endsOn, "endsOn");
}
