import { describe, expect, test } from "vitest";
import { canAccess, PERMISSIONS, type Permission } from "@/lib/engine/permissions";

// A staff account converted from a set owner's keeps what it holds, and gains nothing else as an owner:
// least privilege (common practice: grant only what the records it owns need). New quote requests stay with
// set owners' accounts, since staff and customer accounts are kept apart.

const ALL = Object.keys(PERMISSIONS) as Permission[];

describe("a staff account that holds its own sets", () => {
  test("reaches the portal and answers its own jobs, certificates and claims", () => {
    for (const p of ["portal.use", "estimate.approve", "payment.start", "claim.open", "certificate.download"] as const) {
      expect(canAccess({ role: "technician", holdsSets: true }, p)).toBe(true);
      expect(canAccess({ role: "technician", holdsSets: false }, p)).toBe(p === "certificate.download");
    }
  });

  test("asks for no new quotes and gains no staff right it did not have", () => {
    expect(canAccess({ role: "technician", holdsSets: true }, "quote.request")).toBe(false);
    for (const p of ALL) {
      const staff = canAccess({ role: "technician" }, p);
      if (staff) expect(canAccess({ role: "technician", holdsSets: true }, p)).toBe(true);
      // The owner role's rights are never reached through holding sets.
      if (!canAccess({ role: "owner" }, p) && !canAccess({ role: "customer" }, p))
        expect(canAccess({ role: "technician", holdsSets: true }, p)).toBe(false);
    }
  });

  test("a set owner's own account and an unknown role are unchanged by the flag", () => {
    for (const p of ALL) {
      expect(canAccess({ role: "customer", holdsSets: true }, p)).toBe(canAccess({ role: "customer" }, p));
      expect(canAccess({ role: "visitor", holdsSets: true }, p)).toBe(false);
    }
  });
});
