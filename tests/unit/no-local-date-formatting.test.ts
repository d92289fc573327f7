import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { describe, expect, test } from "vitest";

// ECMA-402 (from memory): Date.prototype.toLocaleString and toLocaleDateString use the host's default time
// zone and locale when none is given, so the same instant reads differently on the server, in each browser and
// in each country (12/2/2026 is 2 December in one and 12 February in another). Everything a person reads goes
// through lib/engine/dates.ts with the shop's zone instead; ISO text is for data only.

const ROOT = path.resolve(__dirname, "../..");
const SCANNED = ["app", "components", "emails", "lib/server"];
const FORBIDDEN: [RegExp, string][] = [
  [/\.toLocaleDateString\(/, "toLocaleDateString("],
  [/\.toLocaleTimeString\(/, "toLocaleTimeString("],
  [/\.toLocaleString\(/, "toLocaleString("],
  [/\.toISOString\(\)\s*\.slice\(0,\s*1[06]\)/, "toISOString().slice(0, 10)"],
];

function sources(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) out.push(...sources(full));
    else if (/\.(ts|tsx|mts)$/.test(name)) out.push(full);
  }
  return out;
}

export function findLocalDateFormatting(files: { file: string; text: string }[]): string[] {
  const hits: string[] = [];
  for (const { file, text } of files) {
    text.split("\n").forEach((line, i) => {
      for (const [re, label] of FORBIDDEN) if (re.test(line)) hits.push(`${file}:${i + 1} ${label}`);
    });
  }
  return hits;
}

describe("dates reach people only through the shop-zone formatter", () => {
  test("the scan catches each forbidden call", () => {
    const samples = [
      'new Date(m.createdAt).toLocaleString("en-US")',
      'paidAt.toLocaleDateString("en-GB", { timeZone: "UTC" })',
      "d.toLocaleTimeString()",
      "row.revokedAt.toISOString().slice(0, 10)",
    ];
    expect(findLocalDateFormatting(samples.map((text, i) => ({ file: `sample${i}`, text })))).toHaveLength(samples.length);
    expect(findLocalDateFormatting([{ file: "ok", text: "formatDate(row.revokedAt, { timeZone })" }])).toEqual([]);
  });

  test(`no file in ${SCANNED.join(", ")} formats a date with the host's zone or slices ISO text for people`, () => {
    const files = SCANNED.flatMap((d) => sources(path.join(ROOT, d))).map((file) => ({
      file: path.relative(ROOT, file),
      text: readFileSync(file, "utf8"),
    }));
    expect(files.length).toBeGreaterThan(50);
    expect(findLocalDateFormatting(files)).toEqual([]);
  });
});
