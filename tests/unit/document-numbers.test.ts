import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { dayInZone } from "@/lib/engine/dates";
import { formatDocumentNumber, MONEY_DOCUMENT_KINDS, parseDocumentNumber, seriesGaps, seriesYear } from "@/lib/engine/documents/numbering";

describe("document numbers", () => {
  it("prints the kind, the year and the sequence padded to four digits (hand-worked examples)", () => {
    // Worked by hand from the scheme: prefix, year, then 1 → 0001, 7 → 0007, 12345 keeps its five digits.
    expect(formatDocumentNumber("receipt", 2026, 1)).toBe("RCT-2026-0001");
    expect(formatDocumentNumber("invoice", 2026, 7)).toBe("INV-2026-0007");
    expect(formatDocumentNumber("refund", 2027, 12345)).toBe("RFD-2027-12345");
    expect(() => formatDocumentNumber("receipt", 2026, 0)).toThrow(/whole number/);
    expect(() => formatDocumentNumber("receipt", 26, 1)).toThrow(/four-digit/);
  });

  it("reads a number back and refuses text that is not one of ours", () => {
    expect(parseDocumentNumber("INV-2026-0007")).toEqual({ kind: "invoice", year: 2026, sequence: 7 });
    expect(parseDocumentNumber("INV-2026-0000")).toBeNull();
    expect(parseDocumentNumber("INV-2026-07")).toBeNull();
    expect(parseDocumentNumber("ABC-2026-0007")).toBeNull();
    expect(parseDocumentNumber("INV-2026-01234")).toBeNull(); // a five-digit number never starts with 0
  });

  it("round-trips, and within a year text order is numeric order up to 9999 (fast-check property)", () => {
    const kind = fc.constantFrom(...MONEY_DOCUMENT_KINDS);
    fc.assert(
      fc.property(kind, fc.integer({ min: 2000, max: 9999 }), fc.integer({ min: 1, max: 10_000_000 }), (k, y, n) => {
        expect(parseDocumentNumber(formatDocumentNumber(k, y, n))).toEqual({ kind: k, year: y, sequence: n });
      }),
    );
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9999 }), fc.integer({ min: 1, max: 9999 }), (a, b) => {
        const [x, y] = [formatDocumentNumber("receipt", 2026, a), formatDocumentNumber("receipt", 2026, b)];
        expect(Math.sign(x.localeCompare(y, "en"))).toBe(Math.sign(a - b));
      }),
    );
  });

  it("finds the gaps an auditor would ask about", () => {
    // By hand: 1, 2, 4, 7 issued → 3, 5 and 6 are missing.
    expect(seriesGaps([4, 1, 7, 2])).toEqual([3, 5, 6]);
    expect(seriesGaps([3, 1, 2])).toEqual([]);
    expect(seriesGaps([])).toEqual([]);
  });

  it("counts a document in the shop's year, not UTC's", () => {
    // 1 January 2027, 03:00 UTC is still 31 December 2026, 22:00 in New York (UTC−5 in winter; common practice).
    const instant = new Date("2027-01-01T03:00:00Z");
    expect(seriesYear(dayInZone(instant, "America/New_York"))).toBe(2026);
    expect(seriesYear(dayInZone(instant, "UTC"))).toBe(2027);
  });
});
