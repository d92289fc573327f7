import { describe, expect, it } from "vitest";
import { safeNextPath } from "@/lib/validation/next-path";

// The return address after sign-in. Reference: the WHATWG URL Standard (special schemes treat "\" as "/",
// and ASCII tab and newline are removed before parsing), which Node's URL and Chromium both implement; the
// hostile forms are the usual open-redirect payloads (common practice: OWASP "Unvalidated Redirects and
// Forwards" cheat sheet).
const ORIGIN = "http://127.0.0.1:3000";

describe("the return address after sign-in", () => {
  it("keeps same-origin paths with their query and fragment", () => {
    expect(safeNextPath("/portal/jobs/42?tab=history#top", ORIGIN)).toBe("/portal/jobs/42?tab=history#top");
    expect(safeNextPath("/office", ORIGIN)).toBe("/office");
  });

  it("refuses every form that leaves the origin", () => {
    const hostile = [
      "//other.example/path", // protocol-relative
      "/\\other.example/path", // backslash, as /sign-in?next=/%5Cother.example/path decodes
      "\\\\other.example/path",
      "/\t/other.example/path", // tab removed by the parser
      "/\n/other.example/path",
      "\t//other.example",
      "https://other.example/path",
      "http:other.example",
      "javascript:alert(1)",
      "data:text/html,hi",
      " //other.example",
      "http://127.0.0.1:3001/portal", // same host, other port: another origin
    ];
    for (const next of hostile) expect(safeNextPath(next, ORIGIN), JSON.stringify(next)).toBe("/after-sign-in");
  });

  it("treats still-encoded slashes as part of a path on our origin, never as a host", () => {
    // %5C and %2F stay encoded in a path: the browser does not read them as separators.
    expect(safeNextPath("/%5Cother.example/path", ORIGIN)).toBe("/%5Cother.example/path");
    expect(safeNextPath("/%2F%2Fother.example", ORIGIN)).toBe("/%2F%2Fother.example");
    expect(new URL(safeNextPath("/%5Cother.example/path", ORIGIN), ORIGIN).origin).toBe(ORIGIN);
  });

  it("falls back on empty, absurdly long or relative values", () => {
    expect(safeNextPath(undefined, ORIGIN)).toBe("/after-sign-in");
    expect(safeNextPath("", ORIGIN)).toBe("/after-sign-in");
    expect(safeNextPath(`/${"a".repeat(3000)}`, ORIGIN)).toBe("/after-sign-in");
    expect(safeNextPath("portal", ORIGIN)).toBe("/after-sign-in");
  });
});
