import { EngineError } from "./engine-error";

// Dates and times as people read them, one style per audience, always in the shop's time zone. Built on
// Intl.DateTimeFormat so the month names and orders come from the locale data, never from a table of ours.
//
// - "long" (customers, e-mails, certificates): "2 December 2026", "2 December 2026, 14:05 GMT".
// - "compact" (staff tables): "2 Dec 2026", "2 Dec 2026, 14:05".
// Neither ever writes the month as a number, so no reader can swap day and month. ISO dates stay for data
// (CSV, JSON, the signed certificate content).

/** The locale every page, e-mail and PDF is written in. */
export const DISPLAY_LOCALE = "en-GB";

/**
 * The zone a shop starts with until the owner sets its own. The product design names none for the demo shop;
 * its warranty wording speaks of states and its prices are in US dollars, so US Eastern time.
 */
export const DEFAULT_SHOP_TIME_ZONE = "America/New_York";

export type DateStyle = "long" | "compact";
export type DateInput = Date | string | number | null | undefined;
export type ZoneOptions = { timeZone: string; style?: DateStyle; locale?: string };

const EMPTY = "—";
const ISO_DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

/**
 * The zone's canonical IANA name ("europe/london" → "Europe/London", "US/Eastern" → "America/New_York"),
 * or null when Intl does not know it. Fixed offsets ("+01:00") are refused: they ignore summer time.
 */
export function canonicalTimeZone(name: string): string | null {
  const trimmed = name.trim();
  // Region names only ("Area/City"), or UTC: abbreviations such as "EST" are ambiguous and some map to a
  // zone the owner did not mean.
  if (!/^(?:[A-Za-z][A-Za-z0-9_+-]*(?:\/[A-Za-z0-9_+-]+)+|UTC)$/i.test(trimmed)) return null;
  try {
    return new Intl.DateTimeFormat("en", { timeZone: trimmed }).resolvedOptions().timeZone;
  } catch {
    return null;
  }
}

export function isTimeZone(name: string): boolean {
  return canonicalTimeZone(name) !== null;
}

/** The zones a shop can choose from, as Intl lists them (plus UTC, which Intl leaves out of that list). */
export function timeZoneChoices(): string[] {
  const listed = typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : [];
  return listed.includes("UTC") ? listed : [...listed, "UTC"];
}

// Formatters are costly to build and these few are used on every row of every table.
const formatters = new Map<string, Intl.DateTimeFormat>();
function formatter(locale: string, timeZone: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${locale}|${timeZone}|${JSON.stringify(options)}`;
  let f = formatters.get(key);
  if (!f) {
    try {
      f = new Intl.DateTimeFormat(locale, { ...options, timeZone });
    } catch {
      throw new EngineError("time-zone", `"${timeZone}" is not a time zone this system knows.`, "timeZone");
    }
    formatters.set(key, f);
  }
  return f;
}

const DAY_PARTS: Record<DateStyle, Intl.DateTimeFormatOptions> = {
  long: { day: "numeric", month: "long", year: "numeric" },
  compact: { day: "numeric", month: "short", year: "numeric" },
};
const TIME_PARTS: Intl.DateTimeFormatOptions = { hour: "2-digit", minute: "2-digit", hourCycle: "h23" };

// Locale data versions differ in thin and narrow no-break spaces (around a range's dash, before a zone name):
// plain spaces keep the server's and the browser's text identical.
const plain = (text: string) => text.replace(/[\u2009\u202f\u00a0]/g, " ");

function toInstant(value: DateInput): Date | null {
  if (value === null || value === undefined || value === "") return null;
  const d = value instanceof Date ? value : new Date(value);
  return Number.isNaN(d.getTime()) ? null : d;
}

/** The calendar day of an instant in the shop's zone: "2 December 2026" (long) or "2 Dec 2026" (compact). */
export function formatDate(value: DateInput, { timeZone, style = "long", locale = DISPLAY_LOCALE }: ZoneOptions): string {
  const d = toInstant(value);
  return d ? formatter(locale, timeZone, DAY_PARTS[style]).format(d) : EMPTY;
}

/** The time of day in the shop's zone, 24-hour: "14:05", or "14:05 GMT" with the zone. */
export function formatTime(
  value: DateInput,
  { timeZone, locale = DISPLAY_LOCALE, showZone = false }: ZoneOptions & { showZone?: boolean },
): string {
  const d = toInstant(value);
  if (!d) return EMPTY;
  return plain(formatter(locale, timeZone, showZone ? { ...TIME_PARTS, timeZoneName: "short" } : TIME_PARTS).format(d));
}

/**
 * Day and time in the shop's zone. The two halves are formatted apart and joined with a comma, because
 * locale data versions disagree on the joint ("," or " at ") and a server and a browser must print the
 * same text. `showZone` adds the zone's short name where a reader elsewhere could misread the time.
 */
export function formatDateTime(value: DateInput, options: ZoneOptions & { showZone?: boolean }): string {
  const d = toInstant(value);
  if (!d) return EMPTY;
  return `${formatDate(d, options)}, ${formatTime(d, options)}`;
}

/** Two instants as a span of days in the shop's zone: "2 – 20 December 2026", "30 Nov – 2 Dec 2026". */
export function formatDateRange(
  from: DateInput,
  to: DateInput,
  { timeZone, style = "long", locale = DISPLAY_LOCALE }: ZoneOptions,
): string {
  const a = toInstant(from);
  const b = toInstant(to);
  if (!a || !b) return EMPTY;
  const [first, last] = a.getTime() <= b.getTime() ? [a, b] : [b, a];
  return plain(formatter(locale, timeZone, DAY_PARTS[style]).formatRange(first, last));
}

// ─── Calendar days (warranty terms, issue and return days) ───
// A day stored as "YYYY-MM-DD" is a day, not an instant: it prints as that day whatever the shop's zone,
// so it is formatted at its own UTC midnight in UTC.

function dayAsInstant(isoDay: string): Date | null {
  const m = ISO_DAY.exec(isoDay);
  if (!m) return null;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.getUTCDate() === Number(m[3]) && d.getUTCMonth() === Number(m[2]) - 1 ? d : null;
}

/** "2026-12-02" → "2 December 2026" (long) or "2 Dec 2026" (compact); text that is not a day is left as it is. */
export function formatDay(
  isoDay: string | null | undefined,
  { style = "long", locale = DISPLAY_LOCALE }: { style?: DateStyle; locale?: string } = {},
): string {
  if (!isoDay) return EMPTY;
  const d = dayAsInstant(isoDay);
  return d ? formatter(locale, "UTC", DAY_PARTS[style]).format(d) : isoDay;
}

/** Two stored days as a span: "2 – 20 December 2026". */
export function formatDayRange(
  fromDay: string,
  toDay: string,
  { style = "long", locale = DISPLAY_LOCALE }: { style?: DateStyle; locale?: string } = {},
): string {
  const a = dayAsInstant(fromDay);
  const b = dayAsInstant(toDay);
  if (!a || !b) return `${formatDay(fromDay, { style, locale })} – ${formatDay(toDay, { style, locale })}`;
  const [first, last] = a.getTime() <= b.getTime() ? [a, b] : [b, a];
  return plain(formatter(locale, "UTC", DAY_PARTS[style]).formatRange(first, last));
}

/** The ISO calendar day ("2026-12-02") on which an instant falls in the shop's zone: for data and for day counts. */
export function dayInZone(value: Date | string | number, timeZone: string): string {
  const d = toInstant(value);
  if (!d) throw new EngineError("date-invalid", "That is not a date and time.", "date");
  const parts = formatter("en-US", timeZone, { year: "numeric", month: "2-digit", day: "2-digit" }).formatToParts(d);
  const get = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? "";
  return `${get("year").padStart(4, "0")}-${get("month")}-${get("day")}`;
}
