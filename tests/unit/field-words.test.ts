import { describe, expect, test } from "vitest";
import type { z } from "zod";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import { profileUpdateSchema, readingInputSchema, returnSchema } from "@/lib/validation/bench";
import { claimFormSchema, decideClaimSchema } from "@/lib/validation/claims";
import { draftSchema } from "@/lib/validation/estimate";
import { manualPaymentSchema, refundFormSchema, settingsFormSchema, settingsToForm, voidPaymentSchema } from "@/lib/validation/office";
import { intakeSchema, recordDecisionSchema } from "@/lib/validation/intake";
import { partFormSchema } from "@/lib/validation/parts";
import { quoteRequestSchema } from "@/lib/validation/quote";
import { aurelianTableSet } from "./support/demo-sets";

// Every message a person can meet on a form names its field and says what is allowed. The checks compare
// against zod's own default wording (zod 4 documentation, "Customizing errors": "Invalid input: expected
// string, received number", "Too small: expected number to be >0", "Invalid option: expected one of …"),
// which must never come through, and against the labels the forms print beside each field.

const ZOD_DEFAULT =
  /\bexpected\b|\breceived\b|[<>]=?\s?-?\d|Invalid (input|option|string|email|uuid|UUID|key|element)|Too (small|big)|Unrecognized key/;
// "Field name: what is allowed." — a capitalised name, a colon, then words.
const NAMED = /^[A-Z0-9+][^:]{0,60}: \S/;

const BAD_VALUES: unknown[] = [99999, -1, 1.5, Number.NaN, "abc", "", "  ", null, true, {}, ["x"], "x".repeat(5000)];

/** Every leaf path of a value (arrays and objects walked), the containers themselves included. */
function paths(value: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  const out: (string | number)[][] = prefix.length ? [prefix] : [];
  if (Array.isArray(value)) value.forEach((v, i) => out.push(...paths(v, [...prefix, i])));
  else if (value && typeof value === "object")
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) out.push(...paths(v, [...prefix, k]));
  return out;
}

function withValue(base: unknown, path: (string | number)[], bad: unknown): unknown {
  const copy = structuredClone(base) as Record<string | number, unknown>;
  let at = copy;
  for (const key of path.slice(0, -1)) at = at[key] as Record<string | number, unknown>;
  at[path.at(-1)!] = bad;
  return copy;
}

/** Every message the schema gives for the base with one field replaced by a bad value, field by field. */
function sweep(schema: z.ZodType, base: unknown): { path: string; bad: unknown; message: string }[] {
  expect(schema.safeParse(base).success).toBe(true);
  const out: { path: string; bad: unknown; message: string }[] = [];
  for (const path of paths(base)) {
    for (const bad of BAD_VALUES) {
      const r = schema.safeParse(withValue(base, path, bad));
      if (!r.success)
        for (const issue of r.error.issues) out.push({ path: path.join("."), bad: String(bad).slice(0, 12), message: issue.message });
    }
  }
  return out;
}

const labourLine = {
  key: "k1",
  kind: "labour",
  code: "recap.paper",
  title: "Replace paper capacitors",
  category: "recap",
  minutes: 60,
  quantity: 1,
  reason: "Paper capacitors leak with age.",
  readings: [],
  unitCost: "",
  markupPercent: "",
  covered: false,
};
const partLine = {
  ...labourLine,
  key: "k2",
  kind: "part",
  code: "part.cap.film",
  title: "Film capacitor",
  category: "parts",
  minutes: 0,
  unitCost: "1.20",
  markupPercent: "35",
};

const SCHEMAS: [string, z.ZodType, unknown][] = [
  ["the set profile (triage)", profileUpdateSchema, { maker: "Aurelian", model: "5T", year: 1952, profile: aurelianTableSet }],
  ["the estimate builder", draftSchema, { lines: [labourLine, partLine] }],
  ["a bench-sheet reading", readingInputSchema, { key: "bplus", value: 250, note: "" }],
  ["the return", returnSchema, { method: "shipped", carrier: "Port Alder Post", trackingNumber: "PA 1234" }],
  [
    "the owner's claim",
    claimFormSchema,
    { code: "", symptomCategory: "hum", description: "It hums after warming up.", statements: [], photos: [] },
  ],
  ["the claim decision", decideClaimSchema, { decision: "reject", reason: "The cabinet was opened.", findings: ["excl.opened-by-others"] }],
  [
    "the owner's request",
    quoteRequestSchema,
    {
      maker: "Corvane",
      model: "Seven",
      year: 1961,
      serial: "",
      kind: "transistor-battery",
      bands: ["MW"],
      dialMarkings: "",
      symptoms: "No sound at all, lamp lights.",
      priorWork: "",
      poweredRecently: "no",
      delivery: "mail-in",
      contactPreference: "email",
      phone: "",
      cautionsAcknowledged: true,
      photos: ["ticket-1"],
      idempotencyKey: "0b9c1f4e-8d2a-4c3b-9e7f-1a2b3c4d5e6f",
    },
  ],
  [
    "the office settings",
    settingsFormSchema,
    settingsToForm({
      name: "Kestrel Lane Wireless",
      addressLines: ["14 Kestrel Lane", "Port Alder"],
      timeZone: "America/New_York",
      phone: "555-0100",
      email: "",
      policy: defaultShopPolicy,
      warrantyTerms: {},
      version: 1,
    }),
  ],
  ["a refund", refundFormSchema, { amount: "12.00", reason: "Part not fitted.", kind: "reduction" }],
  [
    "counter intake",
    intakeSchema,
    {
      customerMode: "new",
      customerId: "",
      customerName: "Perrin Ashdown",
      customerEmail: "perrin@example.org",
      customerPhone: "+1 555 0163",
      access: "invite",
      maker: "Corvane",
      model: "Seven",
      year: 1961,
      serial: "",
      kind: "transistor-battery",
      bands: ["MW"],
      dialMarkings: "",
      symptoms: "No sound at all, lamp lights.",
      priorWork: "",
      poweredRecently: "no",
      channel: "counter",
      setAtShop: true,
      contactPreference: "email",
      cautionsGiven: true,
      photos: ["ticket-1"],
      idempotencyKey: "0b9c1f4e-8d2a-4c3b-9e7f-1a2b3c4d5e6f",
    },
  ],
  [
    "a decision recorded for the owner",
    recordDecisionSchema,
    { revisionId: "0b9c1f4e-8d2a-4c3b-9e7f-1a2b3c4d5e6f", decision: "approve", medium: "phone", note: "Agreed by phone." },
  ],
  [
    "a catalogue part",
    partFormSchema,
    { name: "Pilot lamp 6.3 V", supplierRef: "TW-PL-063", cost: "0.90", markupPercent: "50", stock: "12" },
  ],
  [
    "cash or a cheque at the counter",
    manualPaymentSchema,
    {
      job: "KL-0042",
      amount: "12.00",
      method: "cheque",
      chequeNumber: "004417",
      receivedOn: "2026-03-01",
      idempotencyKey: "form-key-1234",
    },
  ],
  ["voiding a counter entry", voidPaymentSchema, { reason: "Typed on the wrong job." }],
];

describe("every field message names its field and what is allowed, never zod's default wording", () => {
  for (const [name, schema, base] of SCHEMAS) {
    test(name, () => {
      const messages = sweep(schema, base);
      expect(messages.length).toBeGreaterThan(0);
      const defaults = messages.filter((m) => ZOD_DEFAULT.test(m.message));
      expect(defaults.slice(0, 5)).toEqual([]);
      const unnamed = messages.filter((m) => !NAMED.test(m.message));
      expect(unnamed.slice(0, 5)).toEqual([]);
    });
  }
});

describe("number fields give the name printed on the form and the range allowed", () => {
  const profile = { maker: "Aurelian", model: "5T", year: 1952, profile: aurelianTableSet };
  const fieldMessage = (schema: z.ZodType, base: unknown, path: (string | number)[], bad: unknown) => {
    const r = schema.safeParse(withValue(base, path, bad));
    expect(r.success).toBe(false);
    return r.error!.issues.find((i) => i.path.join(".") === path.join("."))?.message;
  };

  // The labels are the ones the triage form prints beside each field (components/bench/triage-panel.tsx).
  test.each([
    [["profile", "paperCapacitors"], "Paper capacitors", 0, 120],
    [["profile", "electrolytics"], "Electrolytic capacitors", 0, 60],
    [["profile", "tubes"], "Tubes", 0, 40],
    [["profile", "ifTransformers"], "IF transformers", 0, 12],
  ] as const)("%j: 99999, -1, 2.5 and letters all say '%s: enter a whole number from %i to %i.'", (path, label, min, max) => {
    for (const bad of [99999, "99999", -1, "-1", 2.5, "abc"]) {
      expect(fieldMessage(profileUpdateSchema, profile, [...path], bad)).toBe(`${label}: enter a whole number from ${min} to ${max}.`);
    }
  });

  test("B+ at or below zero names the field and the range, not '>0'", () => {
    const m = fieldMessage(profileUpdateSchema, profile, ["profile", "bPlusVolts"], -5);
    expect(m).toMatch(/^B\+ on the schematic: .*above 0.*1000/);
  });

  test("the estimate's minutes and quantity (the builder's column heads: Minutes, Qty)", () => {
    const base = { lines: [labourLine] };
    expect(fieldMessage(draftSchema, base, ["lines", 0, "minutes"], 99999)).toBe("Minutes: enter a whole number from 0 to 6000.");
    expect(fieldMessage(draftSchema, base, ["lines", 0, "minutes"], "1.5")).toBe("Minutes: enter a whole number from 0 to 6000.");
    expect(fieldMessage(draftSchema, base, ["lines", 0, "quantity"], 0)).toBe("Quantity: enter a whole number from 1 to 1000.");
  });
});
