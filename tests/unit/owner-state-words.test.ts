import { describe, expect, test } from "vitest";
import { JOB_STATES, ownerStateLabel, STATE_LABEL, staffStateLabel, TRANSITIONS, type JobState } from "@/lib/engine/jobs/states";

// The owner's words for each state are checked against what the state table says is true in that state,
// not against the words themselves. Where the set is follows from the table: it leaves the shop only on the
// staff's move to "returned" (the return is recorded as a pick-up or a shipment). A set handed to a carrier
// is in transit, not yet with its owner (common practice in shipping: delivered is a later event than
// shipped), and a set collected at the counter is with its owner.

const CLAIMS_WITH_OWNER = /back with you|with you now|returned to you|you have it/i;
const CLAIMS_ON_ITS_WAY = /on its way|shipped|in transit|with the carrier/i;
const CLAIMS_COLLECTED = /collected|picked up/i;

/** States from which the table can still reach "returned": the set has not left the shop (or reached it). */
function canStillBeReturned(state: JobState): boolean {
  const seen = new Set<JobState>();
  const walk = (s: JobState): boolean => {
    if (seen.has(s)) return false;
    seen.add(s);
    return (Object.keys(TRANSITIONS[s]) as JobState[]).some((n) => n === "returned" || walk(n));
  };
  return walk(state);
}

describe("the owner's state words say what is true in each state", () => {
  test("the table itself: a job reaches 'returned' only from 'paid in full', by the staff's move", () => {
    const into = JOB_STATES.filter((s) => TRANSITIONS[s].returned);
    expect(into).toEqual(["paid_in_full"]);
    expect(TRANSITIONS.paid_in_full.returned).toBe("staff");
  });

  for (const state of JOB_STATES.filter(canStillBeReturned)) {
    test(`${state}: the set has not left the shop, so nothing says it is on its way or back`, () => {
      for (const method of [undefined, null, "pick-up", "shipped"] as const) {
        const words = ownerStateLabel(state, method);
        expect(words).not.toMatch(CLAIMS_WITH_OWNER);
        expect(words).not.toMatch(CLAIMS_ON_ITS_WAY);
        expect(words).not.toMatch(CLAIMS_COLLECTED);
      }
    });
  }

  test("paid in full (entered by the system once nothing is owed): says it is paid, and that the shop still has it", () => {
    expect(TRANSITIONS.balance_due.paid_in_full).toBe("system");
    const words = ownerStateLabel("paid_in_full");
    expect(words).toMatch(/paid in full/i);
    expect(words).toMatch(/ready to return|being prepared|getting it ready/i);
  });

  test("returned by shipment: on its way with the carrier, never 'back with you'", () => {
    const words = ownerStateLabel("returned", "shipped");
    expect(words).toMatch(CLAIMS_ON_ITS_WAY);
    expect(words).not.toMatch(CLAIMS_WITH_OWNER);
  });

  test("returned at the counter: collected, back with the owner", () => {
    const words = ownerStateLabel("returned", "pick-up");
    expect(words).toMatch(CLAIMS_COLLECTED);
    expect(words).toMatch(CLAIMS_WITH_OWNER);
  });

  test("the closed states other than 'returned' never speak of a return", () => {
    for (const state of JOB_STATES.filter((s) => Object.keys(TRANSITIONS[s]).length === 0 && s !== "returned")) {
      expect(ownerStateLabel(state)).not.toMatch(CLAIMS_WITH_OWNER);
      expect(ownerStateLabel(state)).not.toMatch(CLAIMS_ON_ITS_WAY);
    }
  });

  test("every state has owner words of its own, distinct from the workshop's internal names", () => {
    for (const state of JOB_STATES) {
      expect(ownerStateLabel(state).length).toBeGreaterThan(0);
      expect(ownerStateLabel(state)).not.toContain("_");
      expect(STATE_LABEL[state].owner).toBe(ownerStateLabel(state));
    }
  });
});

describe("a set already at the shop (handed over at the counter)", () => {
  // Common practice at a repair counter: a set left with the shop is not asked for again. The table's move
  // from "deposit paid" to the bench is the staff's (the set is in hand), so only the words change.
  test("after the deposit, the owner is not asked to send the set, and is told the shop has it", () => {
    expect(TRANSITIONS.deposit_paid.on_bench).toBe("staff");
    expect(ownerStateLabel("deposit_paid")).toMatch(/send/i);
    const words = ownerStateLabel("deposit_paid", null, true);
    expect(words).not.toMatch(/send|bring|post|ship/i);
    expect(words).toMatch(/with us/i);
    expect(words).not.toMatch(CLAIMS_WITH_OWNER);
  });

  test("the workshop does not read it as a set still to arrive", () => {
    expect(staffStateLabel("deposit_paid")).toMatch(/awaiting set/i);
    const words = staffStateLabel("deposit_paid", true);
    expect(words).not.toMatch(/awaiting|to arrive|send/i);
    expect(words).toMatch(/at the shop/i);
  });
});
