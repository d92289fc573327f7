import { formatDay } from "../dates";
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

export type WarrantyTerm = {
  /** First day of cover. */
  startsOn: string;
  /** Last day of cover, included. */
  endsOn: string;
  termDays: number;
  /** The day the set was returned, when known; a fault on that day itself is inside the cover too. */
  returnedOn?: string;
};

/**
 * The term counts from the day after the return, the day of the event left out as periods are usually
 * counted: a 90-day term after a return on 2025-03-01 runs from 2025-03-02 to 2025-05-30, both included.
 */
export function computeWarrantyTerm(returnedOn: string, termDays: number): WarrantyTerm & { returnedOn: string } {
  if (!Number.isSafeInteger(termDays) || termDays < 0) {
    throw new EngineError("not-whole", "The warranty term is a whole number of days.", "termDays");
  }
  const returned = dayNumber(returnedOn, "completedOn");
  return {
    returnedOn,
    startsOn: isoFromDayNumber(returned + 1),
    endsOn: isoFromDayNumber(returned + termDays),
    termDays,
  };
}

export function isWithinTerm(term: WarrantyTerm, onDate: string): boolean {
  if (term.termDays === 0) return false;
  const d = dayNumber(onDate, "reportedOn");
  const from = Math.min(dayNumber(term.startsOn, "startsOn"), term.returnedOn ? dayNumber(term.returnedOn, "returnedOn") : Infinity);
  return d >= from && d <= dayNumber(term.endsOn, "endsOn");
}

/**
 * The term in words, with both dates written out ("2 March 2025"): the days are calendar days and print as
 * themselves in any zone. Certificates signed before the term counted from the day after
 * the return start on the return day itself and are described as they were signed.
 */
export function describeTerm(term: { termDays: number; startsOn: string; endsOn: string }, returnedOn: string): string {
  if (term.termDays === 0) return "No warranty term.";
  return term.startsOn === returnedOn
    ? `${term.termDays} days from ${formatDay(term.startsOn)}, the day the set was returned, to ${formatDay(term.endsOn)}.`
    : `${term.termDays} days after the set was returned on ${formatDay(returnedOn)}: from ${formatDay(term.startsOn)} to ${formatDay(term.endsOn)}, both days included.`;
}
