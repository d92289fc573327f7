// Who hears of an event: the rules of the shop written down in DEVELOPERS.md ("Staff notifications"), a
// common-practice arrangement for a small workshop (the person at the bench for their jobs, the owner for
// the rest). fast-check (an independent package) throws arbitrary staff lists at them: the actor and
// deactivated accounts are never chosen, and only staff accounts ever are.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  chooseRecipients,
  DEFAULT_NOTIFICATION_PREFERENCES,
  NOTIFICATION_KINDS,
  resolvePreferences,
  type StaffCandidate,
} from "@/lib/engine/notifications";

const staff: StaffCandidate[] = [
  { id: "odile", role: "owner", active: true },
  { id: "tomas", role: "technician", active: true },
  { id: "priya", role: "technician", active: true },
  { id: "wendel", role: "technician", active: false },
  { id: "mira", role: "customer", active: true },
];

describe("chooseRecipients", () => {
  it("tells the assigned technician alone", () => {
    expect(chooseRecipients({ technicianId: "tomas", staff, actorId: "mira" })).toEqual(["tomas"]);
  });
  it("tells the shop owner when nobody holds the job, or the holder is deactivated or no longer staff", () => {
    expect(chooseRecipients({ technicianId: null, staff, actorId: "mira" })).toEqual(["odile"]);
    expect(chooseRecipients({ technicianId: "wendel", staff, actorId: "mira" })).toEqual(["odile"]);
    expect(chooseRecipients({ technicianId: "mira", staff, actorId: null })).toEqual(["odile"]);
  });
  it("never tells the person who caused it: a technician writing on their own set's job hears nothing", () => {
    expect(chooseRecipients({ technicianId: "tomas", staff, actorId: "tomas" })).toEqual([]);
    expect(chooseRecipients({ technicianId: null, staff, actorId: "odile", shopOnly: true })).toEqual([]);
  });
  it("sends money settling back to the shop whoever holds the job", () => {
    expect(chooseRecipients({ technicianId: "tomas", staff, actorId: null, shopOnly: true })).toEqual(["odile"]);
  });
  it("never chooses the actor, a deactivated account or a set owner's account, for any staff list", () => {
    const person = fc.record({
      id: fc.constantFrom("a", "b", "c", "d", "e", "f"),
      role: fc.constantFrom("owner", "technician", "customer"),
      active: fc.boolean(),
    });
    fc.assert(
      fc.property(
        fc.uniqueArray(person, { selector: (p) => p.id, maxLength: 6 }),
        fc.option(fc.constantFrom("a", "b", "c", "d", "e", "f", "z")),
        fc.option(fc.constantFrom("a", "b", "c", "d", "e", "f", "z")),
        fc.boolean(),
        (list, technicianId, actorId, shopOnly) => {
          const chosen = chooseRecipients({ technicianId, staff: list, actorId, shopOnly });
          for (const id of chosen) {
            const p = list.find((s) => s.id === id)!;
            expect(id).not.toBe(actorId);
            expect(p.active).toBe(true);
            expect(["owner", "technician"]).toContain(p.role);
          }
          expect(new Set(chosen).size).toBe(chosen.length);
        },
      ),
    );
  });
});

describe("resolvePreferences", () => {
  it("keeps the defaults where nothing is stored: everything in the app, e-mail for new requests and claims", () => {
    const prefs = resolvePreferences([]);
    for (const k of NOTIFICATION_KINDS) expect(prefs[k].inApp).toBe(true);
    expect(NOTIFICATION_KINDS.filter((k) => prefs[k].email)).toEqual(["quote_requested", "claim_opened"]);
    expect(prefs).toEqual(DEFAULT_NOTIFICATION_PREFERENCES);
  });
  it("takes a stored choice over the default and ignores kinds it does not know", () => {
    const prefs = resolvePreferences([
      { kind: "owner_message", inApp: false, email: true },
      { kind: "no_such_kind", inApp: false, email: false },
    ]);
    expect(prefs.owner_message).toEqual({ inApp: false, email: true });
    expect(prefs.quote_requested).toEqual({ inApp: true, email: true });
  });
});
