import fc from "fast-check";
import { afterEach, describe, expect, test } from "vitest";
import {
  canonicalTimeZone,
  dayInZone,
  formatDate,
  formatDateRange,
  formatDateTime,
  formatDay,
  formatDayRange,
  formatTime,
  timeZoneChoices,
} from "@/lib/engine/dates";
import { todayIso } from "@/lib/engine/certificates/document";
import { describeTerm } from "@/lib/engine/warranty/term";
import { timeZoneText } from "@/lib/validation/office";

// Two kinds of outside source:
// - the zone rules of the IANA tz database, from memory: the UK changes to BST on the last Sunday of March at
//   01:00 UTC and back on the last Sunday of October at 01:00 UTC (29 March and 25 October 2026); New York
//   goes from EST (UTC-5) to EDT (UTC-4) on the second Sunday of March at 02:00 local (8 March 2026, 07:00
//   UTC); Paris is UTC+1 in winter; Lagos is UTC+1 all year; Kiritimati is UTC+14, Pago Pago UTC-11.
// - Intl.DateTimeFormat itself (ECMA-402 with the CLDR data of the runtime), built here with the options a
//   reader sees, as the reference for the wording of each style.

const london = { timeZone: "Europe/London" };
const newYork = { timeZone: "America/New_York" };

describe("instants are shown in the shop's zone", () => {
  test("Europe/London across the spring change: 00:59 GMT, then 02:00 BST a minute later", () => {
    expect(formatDateTime("2026-03-29T00:59:00Z", { ...london, showZone: true })).toBe("29 March 2026, 00:59 GMT");
    expect(formatDateTime("2026-03-29T01:00:00Z", { ...london, showZone: true })).toBe("29 March 2026, 02:00 BST");
  });

  test("Europe/London across the autumn change: 01:59 BST, then 01:00 GMT a minute later", () => {
    expect(formatDateTime("2026-10-25T00:59:00Z", { ...london, showZone: true })).toBe("25 October 2026, 01:59 BST");
    expect(formatDateTime("2026-10-25T01:00:00Z", { ...london, showZone: true })).toBe("25 October 2026, 01:00 GMT");
  });

  test("America/New_York across the spring change: 01:59 at UTC-5, then 03:00 at UTC-4", () => {
    expect(formatDateTime("2026-03-08T06:59:00Z", { ...newYork, style: "compact" })).toBe("8 Mar 2026, 01:59");
    expect(formatDateTime("2026-03-08T07:00:00Z", { ...newYork, style: "compact" })).toBe("8 Mar 2026, 03:00");
    // The zone's short name, as CLDR's en-GB data writes it (Intl as the source).
    const named = new Intl.DateTimeFormat("en-GB", { timeZone: "America/New_York", timeZoneName: "short" });
    const zoneOf = (iso: string) => named.formatToParts(new Date(iso)).find((p) => p.type === "timeZoneName")!.value;
    expect(formatTime("2026-03-08T06:59:00Z", { ...newYork, showZone: true })).toBe(`01:59 ${zoneOf("2026-03-08T06:59:00Z")}`);
    expect(formatTime("2026-03-08T07:00:00Z", { ...newYork, showZone: true })).toBe(`03:00 ${zoneOf("2026-03-08T07:00:00Z")}`);
    expect(zoneOf("2026-03-08T06:59:00Z")).not.toBe(zoneOf("2026-03-08T07:00:00Z"));
  });

  test("23:30 UTC is already the next day in a UTC+1 zone, and still the same day in UTC", () => {
    const at = "2026-01-31T23:30:00Z";
    expect(formatDate(at, { timeZone: "UTC" })).toBe("31 January 2026");
    expect(formatDate(at, { timeZone: "Europe/Paris" })).toBe("1 February 2026");
    expect(formatDateTime(at, { timeZone: "Africa/Lagos", style: "compact" })).toBe("1 Feb 2026, 00:30");
    expect(dayInZone(at, "Africa/Lagos")).toBe("2026-02-01");
    expect(dayInZone(at, "UTC")).toBe("2026-01-31");
    // West of Greenwich the day is still the previous one.
    expect(dayInZone("2026-12-02T03:00:00Z", "America/New_York")).toBe("2026-12-01");
  });

  test("UTC+14 and UTC-11 are never on the same calendar day", () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(2000, 0, 1), max: Date.UTC(2035, 0, 1) }), (ms) => {
        expect(dayInZone(ms, "Pacific/Kiritimati")).not.toBe(dayInZone(ms, "Pacific/Pago_Pago"));
      }),
    );
  });

  test("the certificate's today is the shop's calendar day", () => {
    const at = new Date("2026-01-31T23:30:00Z");
    expect(todayIso(at, "Europe/Paris")).toBe("2026-02-01");
    expect(todayIso(at)).toBe("2026-01-31");
  });
});

describe("one style per audience", () => {
  const at = new Date("2026-12-02T14:05:00Z");

  test("customers read the long date, staff the compact one, as Intl writes them in en-GB", () => {
    const long = new Intl.DateTimeFormat("en-GB", { timeZone: "UTC", day: "numeric", month: "long", year: "numeric" }).format(at);
    const short = new Intl.DateTimeFormat("en-GB", { timeZone: "UTC", day: "numeric", month: "short", year: "numeric" }).format(at);
    expect(long).toBe("2 December 2026");
    expect(formatDate(at, { timeZone: "UTC" })).toBe(long);
    expect(formatDate(at, { timeZone: "UTC", style: "compact" })).toBe(short);
    expect(formatDateTime(at, { timeZone: "UTC", style: "compact" })).toBe("2 Dec 2026, 14:05");
  });

  test("no style writes the month as a number, in any zone", () => {
    const zones = timeZoneChoices();
    fc.assert(
      fc.property(
        fc.integer({ min: Date.UTC(1990, 0, 1), max: Date.UTC(2060, 0, 1) }),
        fc.constantFrom(...zones),
        fc.constantFrom("long" as const, "compact" as const),
        (ms, timeZone, style) => {
          const text = formatDateTime(ms, { timeZone, style, showZone: true });
          expect(text).toMatch(/^\d{1,2} [A-Z][a-z]{2,8} \d{4}, \d{2}:\d{2} /);
          expect(text).not.toMatch(/\d{1,2}\/\d{1,2}/);
        },
      ),
      { numRuns: 300 },
    );
  });

  test("spans of days are Intl's formatRange: shared month and year written once", () => {
    const reference = new Intl.DateTimeFormat("en-GB", { timeZone: "Europe/London", day: "numeric", month: "long", year: "numeric" });
    const from = new Date("2026-12-02T10:00:00Z");
    const to = new Date("2026-12-20T10:00:00Z");
    // Intl puts thin spaces around the dash; the formatter writes plain ones.
    const expected = reference.formatRange(from, to).replace(/\u2009/g, " ");
    expect(expected).toBe("2 – 20 December 2026");
    expect(formatDateRange(from, to, london)).toBe(expected);
    expect(formatDateRange(to, from, london)).toBe(expected);
    expect(formatDateRange("2026-11-30T10:00:00Z", "2026-12-02T10:00:00Z", { ...london, style: "compact" })).toBe("30 Nov – 2 Dec 2026");
  });

  test("a missing or broken value shows a dash, never 'Invalid Date'", () => {
    expect(formatDate(null, london)).toBe("—");
    expect(formatDateTime("not a date", london)).toBe("—");
  });

  test("the text does not depend on the zone of the machine that renders it", () => {
    const before = process.env.TZ;
    const sample = () => [formatDateTime(at, { ...newYork, showZone: true }), formatDay("2026-12-02"), dayInZone(at, "Asia/Tokyo")];
    try {
      process.env.TZ = "UTC";
      const inUtc = sample();
      process.env.TZ = "Pacific/Kiritimati";
      expect(sample()).toEqual(inUtc);
      process.env.TZ = "America/Los_Angeles";
      expect(sample()).toEqual(inUtc);
    } finally {
      if (before === undefined) delete process.env.TZ;
      else process.env.TZ = before;
    }
  });
});

describe("calendar days are days, not instants", () => {
  afterEach(() => {
    delete process.env.TZ;
  });

  test("a stored day prints as that day whatever the zone", () => {
    expect(formatDay("2026-12-02")).toBe("2 December 2026");
    expect(formatDay("2026-12-02", { style: "compact" })).toBe("2 Dec 2026");
    for (const tz of ["America/Los_Angeles", "Pacific/Kiritimati", "Pacific/Pago_Pago"]) {
      process.env.TZ = tz;
      expect(formatDay("2027-03-01")).toBe("1 March 2027");
    }
    // What goes wrong when a day is treated as an instant: its UTC midnight is the evening before in New York.
    expect(formatDate(new Date("2026-12-02T00:00:00Z"), newYork)).toBe("1 December 2026");
  });

  test("a day that does not exist is shown as written, not rolled over", () => {
    expect(formatDay("2026-02-30")).toBe("2026-02-30");
    expect(formatDay(undefined)).toBe("—");
  });

  test("a span of days across a year end", () => {
    expect(formatDayRange("2026-12-28", "2027-01-03")).toBe("28 December 2026 – 3 January 2027");
  });

  test("the warranty term is written with its days in words (a 90-day term after 1 March 2025 ends 30 May 2025)", () => {
    expect(describeTerm({ termDays: 90, startsOn: "2025-03-02", endsOn: "2025-05-30" }, "2025-03-01")).toBe(
      "90 days after the set was returned on 1 March 2025: from 2 March 2025 to 30 May 2025, both days included.",
    );
  });
});

describe("the time-zone setting", () => {
  test("IANA names are accepted and stored in their canonical spelling", () => {
    expect(canonicalTimeZone("Europe/London")).toBe("Europe/London");
    expect(canonicalTimeZone(" europe/london ")).toBe("Europe/London");
    expect(canonicalTimeZone("UTC")).toBe("UTC");
    // Intl as the reference for which names it knows.
    for (const z of Intl.supportedValuesOf("timeZone").slice(0, 50)) expect(canonicalTimeZone(z)).not.toBeNull();
  });

  test("offsets, abbreviations and unknown names are refused with a message naming the field", () => {
    for (const bad of ["+01:00", "EST", "Mars/Olympus_Mons", "", "Europe/London; drop table"]) {
      expect(canonicalTimeZone(bad)).toBeNull();
      const r = timeZoneText.safeParse(bad);
      expect(r.success).toBe(false);
      expect(r.error!.issues[0]!.message).toMatch(/^Time zone: /);
    }
  });
});
