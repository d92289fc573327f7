import { randomUUID } from "node:crypto";
import { DEFAULT_NOTIFICATION_PREFERENCES } from "@/lib/engine/notifications";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { sql } from "../support/db";
import { TestClient } from "../support/http";
import { seedJobWithEstimate } from "../fixtures/jobs";
import { AURELIAN_PROFILE, createJob } from "./bench-fixtures";
import { createCertificate, stopQueue } from "./certificates-fixtures";
import { pathOf, storeAddress, storePhoto } from "./access/fixtures";
import { ROUTES, type Fixtures, type Role, type RouteEntry } from "./access/matrix";

// Random and hostile input on every JSON route of the matrix, as the role allowed to use it: the answer is
// always 2xx or a 4xx with the structured error, never a 5xx or a stack trace; prototype keys change nothing
// in the server; duplicate query parameters get the same answer each time. Mutating routes are aimed at rows
// made for this file (a fresh customer's jobs, certificate, claim and payment), never at the demo jobs.

const RUNS = 30;
const STACK = /(?:\n\s+at\s|\bat .+\(.+:\d+:\d+\)|node_modules[\\/]|\.next[^/]*[\\/]server)/;
const POLLUTION = {
  polluted: "fuzz-polluted",
  pageSize: "7",
  page: "3",
  role: "owner",
  internal: true,
  isAdmin: true,
  emailVerified: true,
};

const UNSTORABLE: unknown[] = ["before\u0000after", 2 ** 31, -(2 ** 31) - 1, 2 ** 53 + 2, 1e308];

type Kind = "app" | "auth" | "upload" | "webhook";
type Sent = { status: number; text: string };

let customer: { client: TestClient; email: string; id: string };
let tech: TestClient;
let owner: TestClient;

// ---- Rows of our own ----------------------------------------------------------------------------------

type OwnRows = { byRoute: Map<string, Fixtures>; fallback: Fixtures; certificateCode: string };
let own: OwnRows;

const key = (e: { method: string; route: string }) => `${e.method} ${e.route}`;

/** The state a route's job starts in, so valid bodies reach the route's real work. */
const STATE_FOR: Record<string, string> = {
  "POST /api/bench/jobs/[id]/triage": "requested",
  "POST /api/bench/jobs/[id]/assign": "in_triage",
  "PUT /api/bench/jobs/[id]/profile": "in_triage",
  "POST /api/bench/jobs/[id]/question": "in_triage",
  "POST /api/bench/jobs/[id]/decline": "in_triage",
  "PUT /api/bench/jobs/[id]/estimate": "in_triage",
  "POST /api/bench/jobs/[id]/estimate/rebuild": "in_triage",
  "POST /api/bench/jobs/[id]/estimate/send": "in_triage",
  "POST /api/bench/jobs/[id]/start-bench": "deposit_paid",
  "POST /api/bench/jobs/[id]/readings": "on_bench",
  "PUT /api/bench/jobs/[id]/performance": "on_bench",
  "POST /api/bench/jobs/[id]/passband": "on_bench",
  "POST /api/bench/jobs/[id]/tasks": "on_bench",
  "POST /api/bench/jobs/[id]/notes": "on_bench",
  "POST /api/bench/jobs/[id]/final-checks": "on_bench",
  "POST /api/bench/jobs/[id]/back-to-bench": "final_checks",
  "POST /api/bench/jobs/[id]/complete": "final_checks",
  "POST /api/bench/jobs/[id]/return": "paid_in_full",
  "POST /api/portal/jobs/[id]/messages": "awaiting_owner",
  "POST /api/portal/jobs/[id]/withdraw": "requested",
  "POST /api/bench/jobs/[id]/cancel": "estimate_sent",
};
const ESTIMATE_ROUTES = new Set([
  "POST /api/portal/jobs/[id]/estimate/approve",
  "POST /api/portal/jobs/[id]/estimate/decline",
  "POST /api/payments/checkout",
]);

async function ownRows(): Promise<OwnRows> {
  const byRoute = new Map<string, Fixtures>();
  const cert = await createCertificate({ customerId: customer.id, maker: "Aurelian", model: "Fuzz 5T" });
  const shared = await createJob({ customerEmail: customer.email, state: "on_bench", technicianEmail: DEMO.tech.email });
  const photoA = await storePhoto({ uploaderId: customer.id, jobId: shared.jobId });
  const sessionA = `cs_fuzz_${randomUUID().replaceAll("-", "")}`;
  const [rev] = await sql<{ id: string }>("select id from estimate_revision where job_id = $1 order by revision desc limit 1", [
    cert.jobId,
  ]);
  const [pay] = await sql<{ id: string }>(
    `insert into payment (job_id, revision_id, purpose, amount_minor, currency, status, checkout_session_id, idempotency_key, paid_at)
     values ($1, $2, 'deposit', 5000, 'USD', 'paid', $3, $4, now()) returning id`,
    [cert.jobId, rev!.id, sessionA, `fuzz-${randomUUID()}`],
  );
  const claim = await customer.client.post("/api/claims", {
    certificateId: cert.certificateId,
    symptomCategory: "hum",
    description: "A hum came back after an hour of playing.",
    statements: [],
    photos: [],
  });
  if (claim.status !== 201) throw new Error(`claim for the fuzz certificate: ${claim.status} ${await claim.text()}`);
  const claimA = ((await claim.json()) as { claim: { id: string } }).claim.id;
  const fallback: Fixtures = {
    jobA: shared.jobId,
    jobOpenA: shared.jobId,
    revisionA: rev!.id,
    certificateA: cert.certificateId,
    claimA,
    paymentA: pay!.id,
    sessionA,
    photoA,
    refundAny: (await sql<{ id: string }>("select id from refund order by created_at limit 1"))[0]!.id,
    emailAny: (await sql<{ id: string }>("select id from email_outbox order by created_at limit 1"))[0]!.id,
    instrumentAny: await fuzzInstrument(shared.jobId),
    addressA: await storeAddress(customer.id),
    addressSparesA: [],
    partAny: "00000000-0000-4000-8000-000000000000",
    documentA: (await sql<{ id: string }>("select id from money_document order by issued_at limit 1"))[0]?.id ?? randomUUID(),
  };
  for (const entry of ROUTES) {
    const k = key(entry);
    if (ESTIMATE_ROUTES.has(k)) {
      const seeded = await seedJobWithEstimate({ email: customer.email });
      byRoute.set(k, { ...fallback, jobA: seeded.jobId, jobOpenA: seeded.jobId, revisionA: seeded.revisionId });
    } else if (STATE_FOR[k]) {
      const job = await createJob({
        customerEmail: customer.email,
        state: STATE_FOR[k]!,
        profile: { ...AURELIAN_PROFILE },
        technicianEmail: DEMO.tech.email,
      });
      for (const [code, title] of [
        ["inspect.first", "Inspection and first measurements"],
        ["recap.electrolytics", "Replace the electrolytic capacitors"],
      ]) {
        await sql("insert into job_task (job_id, code, title) values ($1, $2, $3)", [job.jobId, code, title]);
      }
      byRoute.set(k, { ...fallback, jobA: job.jobId, jobOpenA: job.jobId });
    }
  }
  return { byRoute, fallback, certificateCode: cert.code };
}

// An instrument of the fuzz suite's own, named by a reading so deleting it is refused and it stays for every probe.
async function fuzzInstrument(jobId: string): Promise<string> {
  const [row] = await sql<{ id: string }>(
    `insert into instrument (kind, maker, model, serial, calibrated_on, calibration_due_on)
     values ('meter', 'Port Alder Instruments', 'Fuzz meter', $1, current_date - 30, current_date + 300) returning id`,
    [`FZ-${randomUUID().slice(0, 8)}`],
  );
  await sql(
    "insert into reading (job_id, key, unit, verdict, phase, instrument_id) values ($1, 'bplus', 'V', 'recorded', 'as_received', $2)",
    [jobId, row!.id],
  );
  return row!.id;
}

const fixturesFor = (entry: RouteEntry): Fixtures => own.byRoute.get(key(entry)) ?? own.fallback;

// ---- Who calls what -----------------------------------------------------------------------------------

function roleFor(entry: RouteEntry): Role {
  if (entry.route === "/api/uploadthing") return "customerA";
  const order: Role[] = ["customerA", "technician", "owner", "anonymous"];
  return order.find((r) => entry.rules[r] === "allow" || entry.rules[r] === "own") ?? "anonymous";
}

function clientFor(role: Role): TestClient {
  if (role === "customerA") return customer.client;
  if (role === "technician") return tech;
  if (role === "owner") return owner;
  return new TestClient();
}

function kindOf(entry: RouteEntry): Kind {
  if (entry.route.startsWith("/api/auth/")) return "auth";
  if (entry.route === "/api/uploadthing") return "upload";
  if (entry.route === "/api/webhooks/stripe") return "webhook";
  return "app";
}

// ---- Hostile values -----------------------------------------------------------------------------------

function withOwn(obj: Record<string, unknown>, k: string, v: unknown): Record<string, unknown> {
  // An own property named "__proto__" (what JSON.parse gives), not a prototype change here in the test.
  const out = { ...obj };
  Object.defineProperty(out, k, { value: v, enumerable: true, configurable: true, writable: true });
  return out;
}

const protoObject = withOwn({}, "__proto__", POLLUTION);
const constructorObject = { constructor: { prototype: POLLUTION } };

function nestedArrays(depth: number): unknown {
  let v: unknown = "bottom";
  for (let i = 0; i < depth; i++) v = [v];
  return v;
}

const nastyStrings = fc.constantFrom(
  "__proto__",
  "constructor",
  "prototype",
  "hasOwnProperty",
  "toString",
  "<script>alert(1)</script>",
  "' OR 1=1 --",
  "'; drop table job; --",
  "../../../../etc/passwd",
  "\u0000",
  "\ud800",
  "\u202eevil",
  "𝕂𝕃-0042 📻",
  "NaN",
  "Infinity",
  "-0",
  "1e309",
  "0x1F",
  "",
  " ",
  "null",
  "undefined",
  "true",
  "{{7*7}}",
  "${7*7}",
  "%00%0d%0a",
  "2026-02-30",
  "KL-0001",
  "demo-owner-odile",
);

const numbers = fc.oneof(
  fc.integer(),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.constantFrom(0, -1, 1.5, 2 ** 31, 2 ** 53 + 1, -(2 ** 53), 1e308, -1e308, Number.MIN_VALUE, 455, 1600, 120),
);

const huge = fc.constantFrom("x".repeat(70_000), "€".repeat(20_000), "9".repeat(5_000), "a ".repeat(3_000));

const hostile: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 3, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
  { weight: 3, arbitrary: nastyStrings },
  { weight: 2, arbitrary: numbers },
  { weight: 1, arbitrary: huge },
  { weight: 1, arbitrary: fc.constantFrom<unknown>(true, false, null, [], {}, protoObject, constructorObject) },
  { weight: 1, arbitrary: fc.array(nastyStrings, { maxLength: 5 }) },
  { weight: 1, arbitrary: fc.constantFrom(10, 200, 3000).map(nestedArrays) },
  { weight: 1, arbitrary: fc.uuid() },
  { weight: 1, arbitrary: fc.string({ unit: "grapheme", maxLength: 40 }) },
);

// ---- Bodies per route: the real field names and a valid starting point ------------------------------

type Shape = { fields: string[]; base?: (f: Fixtures) => Record<string, unknown> };

const DRAFT_LINE = {
  key: "l1",
  kind: "labour",
  code: "inspect.first",
  title: "Inspection and first measurements",
  category: "inspection",
  minutes: 30,
  quantity: 1,
  reason: "Every set is inspected first.",
  readings: [],
  unitCost: "",
  markupPercent: "",
  covered: false,
};

const SHAPES: Record<string, Shape> = {
  "POST /api/webhooks/stripe": {
    fields: ["id", "type", "object", "data", "created", "livemode", "api_version"],
    base: () => ({ id: "evt_fuzz", object: "event", type: "checkout.session.completed", data: { object: {} } }),
  },
  "POST /api/uploadthing": {
    fields: ["files", "input"],
    base: () => ({ files: [{ name: "front.jpg", size: 2048, type: "image/jpeg", lastModified: 0 }], input: null }),
  },
  "POST /api/portal/jobs": {
    fields: [
      "maker",
      "model",
      "year",
      "serial",
      "kind",
      "bands",
      "dialMarkings",
      "dialEnds",
      "symptoms",
      "priorWork",
      "poweredRecently",
      "delivery",
      "contactPreference",
      "phone",
      "cautionsAcknowledged",
      "photos",
      "idempotencyKey",
    ],
    base: () => ({
      maker: "Aurelian",
      model: "5T-48",
      year: "1948",
      kind: "tube-acdc",
      bands: ["MW"],
      symptoms: "Hums loudly and then no stations at all.",
      poweredRecently: "briefly",
      delivery: "mail-in",
      contactPreference: "email",
      cautionsAcknowledged: true,
      photos: ["not-an-upload-ticket"],
      idempotencyKey: randomUUID(),
    }),
  },
  "POST /api/portal/jobs/[id]/messages": {
    fields: ["body", "idempotencyKey", "photos", "internal", "authorId", "jobId"],
    base: () => ({ body: "Is the set on the bench yet?", idempotencyKey: randomUUID() }),
  },
  "POST /api/portal/jobs/[id]/messages/read": { fields: ["lastMessageId"], base: () => ({ lastMessageId: randomUUID() }) },
  "POST /api/bench/jobs/[id]/messages": {
    fields: ["body", "idempotencyKey", "photos", "internal"],
    base: () => ({ body: "The new dial cord is fitted.", idempotencyKey: randomUUID() }),
  },
  "POST /api/bench/jobs/[id]/messages/read": { fields: ["lastMessageId"], base: () => ({ lastMessageId: randomUUID() }) },
  "POST /api/portal/jobs/[id]/estimate/approve": { fields: ["revisionId"], base: (f) => ({ revisionId: f.revisionA }) },
  "POST /api/portal/jobs/[id]/estimate/decline": {
    fields: ["revisionId", "reason"],
    base: (f) => ({ revisionId: f.revisionA, reason: "More than I can spend this year." }),
  },
  "POST /api/payments/checkout": {
    fields: ["jobId", "purpose", "amount", "amountMinor", "currency"],
    base: (f) => ({ jobId: f.jobA, purpose: "deposit" }),
  },
  "POST /api/certificates/[id]/revoke": { fields: ["reason"], base: () => ({ reason: "Issued against the wrong serial number." }) },
  "POST /api/certificates/[id]/reissue": { fields: ["reason"], base: () => ({ reason: "Serial number corrected." }) },
  "POST /api/claims": {
    fields: ["certificateId", "symptomCategory", "description", "statements", "photos"],
    base: (f) => ({
      certificateId: f.certificateA,
      symptomCategory: "hum",
      description: "The hum came back after an hour.",
      statements: [],
      photos: [],
    }),
  },
  "POST /api/claims/by-code": {
    fields: ["code", "symptomCategory", "description", "statements", "photos"],
    base: () => ({
      code: own.certificateCode,
      symptomCategory: "no-sound",
      description: "Lights up but no sound at all.",
      statements: [],
      photos: [],
    }),
  },
  "POST /api/claims/[id]/decision": {
    fields: ["decision", "reason", "findings"],
    base: () => ({ decision: "inspect", reason: "", findings: [] }),
  },
  "POST /api/bench/jobs/[id]/assign": { fields: ["technicianId"], base: () => ({ technicianId: "demo-tech-priya" }) },
  "POST /api/bench/jobs/[id]/triage": { fields: ["state", "technicianId"] },
  "PUT /api/bench/jobs/[id]/profile": {
    fields: ["maker", "model", "year", "profile"],
    base: () => ({ maker: "Aurelian", model: "5T-48", year: 1948, profile: { ...AURELIAN_PROFILE } }),
  },
  "POST /api/bench/jobs/[id]/question": {
    fields: ["question", "idempotencyKey"],
    base: () => ({ question: "Does the dial lamp light when you switch it on?", idempotencyKey: randomUUID() }),
  },
  "POST /api/bench/jobs/[id]/decline": { fields: ["reason"], base: () => ({ reason: "The chassis is too far gone to restore safely." }) },
  "PUT /api/bench/jobs/[id]/estimate": { fields: ["version", "lines"], base: () => ({ version: 0, lines: [{ ...DRAFT_LINE }] }) },
  "POST /api/bench/jobs/[id]/estimate/rebuild": { fields: ["version"], base: () => ({ version: 0 }) },
  "POST /api/bench/jobs/[id]/estimate/send": {
    fields: ["version", "changeSummary"],
    base: () => ({ version: 1, changeSummary: "First estimate." }),
  },
  "POST /api/bench/jobs/[id]/start-bench": { fields: ["state"] },
  "POST /api/bench/jobs/[id]/readings": {
    fields: ["key", "value", "note"],
    base: () => ({ key: "leakage.plug-a", value: 0.12, note: "Measured with the plug both ways." }),
  },
  "POST /api/bench/jobs/[id]/tasks": { fields: ["code", "done"], base: () => ({ code: "inspect.first", done: true }) },
  "PUT /api/bench/jobs/[id]/performance": {
    fields: ["enabled", "conditions", "figures"],
    base: () => ({ enabled: true, figures: { "perf.snr": 26 } }),
  },
  "POST /api/bench/jobs/[id]/passband": {
    fields: ["curve", "ifKHz", "method", "points"],
    base: () => ({
      curve: "response",
      ifKHz: 455,
      method: "generator",
      points: [
        { offsetKHz: -10, db: -14 },
        { offsetKHz: 0, db: 0 },
        { offsetKHz: 10, db: -14 },
      ],
    }),
  },
  "POST /api/bench/jobs/[id]/notes": {
    fields: ["body", "idempotencyKey"],
    base: () => ({ body: "Filter caps bulging; ordered replacements.", idempotencyKey: randomUUID() }),
  },
  "POST /api/bench/jobs/[id]/final-checks": { fields: ["force"] },
  "POST /api/bench/jobs/[id]/back-to-bench": { fields: ["reason"] },
  "POST /api/bench/jobs/[id]/complete": { fields: ["force", "balanceMinor"] },
  "POST /api/bench/jobs/[id]/return": {
    fields: ["method", "carrier", "trackingNumber"],
    base: () => ({ method: "shipped", carrier: "Port Alder Parcel", trackingNumber: "PA 1234-5678" }),
  },
  "POST /api/tools/alignment": {
    fields: ["band", "ifKHz", "injection", "gang", "trackingPointsKHz"],
    base: () => ({ band: { lowKHz: 540, highKHz: 1600, kind: "MW" }, ifKHz: 455, gang: { minPF: 12, maxPF: 365 } }),
  },
  "POST /api/tools/estimate": { fields: ["profile"], base: () => ({ profile: { ...AURELIAN_PROFILE } }) },
  "POST /api/tools/dial-fit": {
    fields: ["band", "ifKHz", "injection", "gang", "trackingPointsKHz", "lowEndAdjuster", "readings"],
    base: () => ({
      band: { lowKHz: 540, highKHz: 1600, kind: "MW" },
      ifKHz: 455,
      gang: { minPF: 10, maxPF: 365 },
      readings: [
        { dialKHz: 600, receivedKHz: 588 },
        { dialKHz: 1400, loKHz: 1874.6 },
      ],
    }),
  },
  // The version stays the stale one of the starting body, so even a fully valid body saves nothing.
  "PUT /api/office/settings": {
    fields: [
      "identity",
      "currency",
      "labourRate",
      "billingIncrementMinutes",
      "billingRounding",
      "minutesPerRule",
      "parts",
      "tax",
      "deposit",
      "warranty",
      "warrantyTerms",
      "tolerances",
    ],
  },
  "POST /api/office/payments/[paymentId]/refunds": {
    fields: ["amount", "reason"],
    base: () => ({ amount: "10.00", reason: "Part not needed after all." }),
  },
  "POST /api/office/refunds/[refundId]/check": { fields: ["refundId"] },
  "POST /api/office/emails/[emailId]/resend": { fields: ["emailId"] },
  "POST /api/office/instruments": {
    fields: ["kind", "maker", "model", "serial", "calibratedOn", "calibrationDueOn"],
    base: () => ({
      kind: "meter",
      maker: "Port Alder Instruments",
      model: "KM-F",
      serial: `FZ-${randomUUID().slice(0, 8)}`,
      calibratedOn: "2026-01-05",
      calibrationDueOn: "2027-01-05",
    }),
  },
  "PATCH /api/office/instruments/[id]": {
    fields: ["retired", "calibratedOn", "calibrationDueOn"],
    base: () => ({ calibratedOn: "2026-02-01", calibrationDueOn: "2027-02-01" }),
  },
  "DELETE /api/office/instruments/[id]": { fields: ["id"] },
  "POST /api/staff-invitations/accept": {
    fields: ["token", "password"],
    base: () => ({ token: "not-a-real-invitation", password: "valve-glow-1948-x" }),
  },
  "PATCH /api/portal/account": {
    fields: ["name", "phone", "contactPreference"],
    base: () => ({ name: "Fuzz Owner", phone: "+1 207 555 0100", contactPreference: "phone" }),
  },
  "POST /api/portal/account/addresses": {
    fields: ["recipient", "line1", "line2", "city", "region", "postalCode", "country", "isDefault"],
    base: () => ({ recipient: "Fuzz Owner", line1: "1 Quay Street", city: "Port Alder", region: "ME", postalCode: "04101", country: "US" }),
  },
  "PATCH /api/portal/account/addresses/[id]": {
    fields: ["recipient", "line1", "line2", "city", "region", "postalCode", "country", "isDefault"],
    base: () => ({ recipient: "Fuzz Owner", line1: "2 Quay Street", city: "Toronto", region: "ON", postalCode: "M5V 3L9", country: "CA" }),
  },
  "DELETE /api/portal/account/addresses/[id]": { fields: ["id"] },
  // Never the account's password: a probe must not close the account the other probes use.
  "POST /api/portal/account/close": { fields: ["password", "confirm"], base: () => ({ password: "not-the-password", confirm: true }) },
  "PUT /api/portal/jobs/[id]/return-address": { fields: ["addressId"], base: (f) => ({ addressId: f.addressA }) },
  "POST /api/bench/intake": {
    fields: [
      "customerMode",
      "customerId",
      "customerName",
      "customerEmail",
      "customerPhone",
      "access",
      "maker",
      "model",
      "year",
      "serial",
      "kind",
      "bands",
      "dialMarkings",
      "dialEnds",
      "symptoms",
      "priorWork",
      "poweredRecently",
      "channel",
      "setAtShop",
      "contactPreference",
      "cautionsGiven",
      "photos",
      "idempotencyKey",
    ],
    base: () => ({
      customerMode: "new",
      customerId: "",
      customerName: "Fuzz Walk-in",
      customerEmail: "",
      customerPhone: "+1 555 0100",
      access: "contact",
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
      channel: "phone",
      setAtShop: false,
      contactPreference: "phone",
      cautionsGiven: true,
      photos: [],
      idempotencyKey: randomUUID(),
    }),
  },
  "POST /api/bench/jobs/[id]/decision": {
    fields: ["revisionId", "decision", "medium", "note", "afterDecline"],
    base: () => ({ revisionId: randomUUID(), decision: "approve", medium: "phone", note: "Agreed by phone." }),
  },
  // A job number that does not exist: a body that gets through is refused naming the job, and pays nothing.
  "POST /api/office/payments/manual": {
    fields: ["job", "amount", "method", "chequeNumber", "receivedOn", "idempotencyKey"],
    base: () => ({
      job: "KL-9999999",
      amount: "12.00",
      method: "cheque",
      chequeNumber: "000001",
      receivedOn: "2026-01-15",
      idempotencyKey: randomUUID(),
    }),
  },
  "POST /api/office/payments/[paymentId]/void": { fields: ["reason"], base: () => ({ reason: "Typed on the wrong job." }) },
  // Takes no fields: an empty body, or none.
  "POST /api/staff/notifications/read-all": { fields: ["all"], base: () => ({}) },
  "POST /api/staff/notifications/[id]/read": { fields: ["read"], base: () => ({ read: true }) },
  "PUT /api/staff/notification-preferences": {
    fields: ["preferences"],
    // The defaults: a body that gets through leaves the technician's choices as other tests expect them.
    base: () => ({ preferences: structuredClone(DEFAULT_NOTIFICATION_PREFERENCES) }),
  },
  "POST /api/office/parts": {
    fields: ["name", "supplierRef", "cost", "markupPercent", "stock"],
    base: () => ({ name: `Fuzz lamp ${randomUUID().slice(0, 6)}`, supplierRef: "FZ-1", cost: "0.90", markupPercent: "50", stock: "" }),
  },
  "PATCH /api/office/parts/[id]": {
    fields: ["name", "supplierRef", "cost", "markupPercent", "stock", "retired"],
    base: () => ({ cost: "0.50" }),
  },
  "DELETE /api/office/parts/[id]": { fields: ["id"] },
  "POST /api/portal/jobs/[id]/withdraw": { fields: ["reason"], base: () => ({ reason: "Found the fault myself." }) },
  "POST /api/bench/jobs/[id]/cancel": {
    fields: ["reason", "refund"],
    base: () => ({ reason: "Parts are no longer made.", refund: false }),
  },
};

/** The office settings as the form holds them, with a version that is stale on purpose: a fully valid body is refused with 409. */
let settingsBase: Record<string, unknown> = {};

function shapeFor(entry: RouteEntry): Shape {
  if (key(entry) === "PUT /api/office/settings") return { ...SHAPES[key(entry)]!, base: () => structuredClone(settingsBase) };
  const shape = SHAPES[key(entry)];
  if (!shape) throw new Error(`no body shape for ${key(entry)}: add the route's field names to the fuzz suite`);
  return shape;
}

/** A JSON text: either a whole random document, junk in the real fields, or a valid body with some fields spoiled. */
function bodyArbitrary(shape: Shape, f: Fixtures): fc.Arbitrary<string> {
  const fieldNames = fc.constantFrom(...shape.fields);
  const base: (f: Fixtures) => Record<string, unknown> = shape.base ?? (() => ({}));
  const junkInFields = fc.dictionary(fieldNames, hostile, { maxKeys: shape.fields.length });
  const spoiledBase = fc
    .tuple(fc.uniqueArray(fieldNames, { minLength: 1, maxLength: 2 }), fc.array(hostile, { minLength: 2, maxLength: 2 }))
    .map(([names, values]) => {
      const b = base(f);
      names.forEach((n, i) => (b[n] = values[i]));
      return b;
    });
  const extraKeys = fc
    .dictionary(fc.oneof(nastyStrings, fc.string({ maxLength: 12 })), hostile, { maxKeys: 4 })
    .map((extra) => ({ ...base(f), ...extra }));
  const document = fc.oneof(
    { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 4 }).map((v) => JSON.stringify(v)) },
    { weight: 4, arbitrary: junkInFields.map((v) => JSON.stringify(v)) },
    { weight: 4, arbitrary: spoiledBase.map((v) => JSON.stringify(v)) },
    { weight: 2, arbitrary: extraKeys.map((v) => JSON.stringify(v)) },
    {
      weight: 1,
      arbitrary: fc.constantFrom("", "{", "[1,2", '{"a":}', "nul", "\u0000", '{"body": "unterminated', "1e999999", "x".repeat(300_000)),
    },
  );
  // Prototype keys on top of whatever document came out, as JSON text (an own "__proto__" key).
  return fc.tuple(document, fc.integer({ min: 0, max: 3 })).map(([text, proto]) => {
    if (proto === 0 || !text.startsWith("{") || !text.endsWith("}")) return text;
    const inner = text.slice(1, -1);
    const extra =
      proto === 1
        ? `"__proto__":${JSON.stringify(POLLUTION)}`
        : proto === 2
          ? `"constructor":{"prototype":${JSON.stringify(POLLUTION)}}`
          : `"__proto__":{"__proto__":${JSON.stringify(POLLUTION)}}`;
    return `{${extra}${inner ? `,${inner}` : ""}}`;
  });
}

// ---- Checking an answer -------------------------------------------------------------------------------

function problemOf(kind: Kind, { status, text }: Sent): string | null {
  if (status >= 500) return `answered ${status}: ${text.slice(0, 300)}`;
  if (status < 200 || (status >= 300 && status < 400)) return `answered ${status}`;
  if (STACK.test(text)) return `answer contains a stack trace or server path: ${text.slice(0, 300)}`;
  if (status < 400) return null;
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    return `a ${status} answer that is not JSON: ${text.slice(0, 200)}`;
  }
  const o = body as Record<string, unknown> | null;
  if (kind === "app" || kind === "webhook") {
    const e = (o?.error ?? null) as { code?: unknown; message?: unknown } | null;
    if (!e || typeof e.code !== "string" || typeof e.message !== "string")
      return `a ${status} answer without {error:{code,message}}: ${text.slice(0, 200)}`;
    return null;
  }
  // The sign-in service and the upload SDK have their own structured error: a message (and a code). The upload
  // route also answers in ours for requests the SDK refuses without a body.
  const ours = (o?.error ?? null) as { code?: unknown; message?: unknown } | null;
  if (kind === "upload" && ours && typeof ours.code === "string" && typeof ours.message === "string") return null;
  if (!o || typeof o.message !== "string") return `a ${status} answer without a message: ${text.slice(0, 200)}`;
  return null;
}

async function send(client: TestClient, method: string, path: string, text: string, headers: Record<string, string> = {}): Promise<Sent> {
  const res = await client.request(
    path,
    method === "GET" ? { method, headers } : { method, body: text, headers: { "content-type": "application/json", ...headers } },
  );
  return { status: res.status, text: await res.text() };
}

/** The server still answers, and nothing leaked into Object.prototype: defaults read from missing fields are the real defaults. */
async function expectUnpolluted(where: string) {
  const queue = await tech.get("/api/bench/queue");
  const text = await queue.text();
  expect(queue.status, `${where}: queue after the fuzz`).toBe(200);
  expect(text, where).not.toContain("polluted");
  const q = JSON.parse(text) as { page: number; pageSize: number; rows: Record<string, unknown>[] };
  expect({ page: q.page, pageSize: q.pageSize }, `${where}: defaults of the queue filter`).toEqual({ page: 1, pageSize: 25 });
  const portal = await customer.client.get("/api/portal/jobs");
  expect(portal.status, where).toBe(200);
  const portalText = await portal.text();
  expect(portalText, where).not.toContain("polluted");
  const audit = await owner.get("/api/office/audit");
  expect(audit.status, where).toBe(200);
  expect(await audit.text(), where).not.toContain("fuzz-polluted");
}

// ---- Set-up -------------------------------------------------------------------------------------------

beforeAll(async () => {
  const fresh = await newCustomer("fuzz");
  const [row] = await sql<{ id: string }>(`select id from "user" where email = $1`, [fresh.email]);
  customer = { client: fresh.client, email: fresh.email, id: row!.id };
  tech = new TestClient();
  await tech.signIn(DEMO.tech.email, DEMO.tech.password);
  owner = new TestClient();
  await owner.signIn(DEMO.owner.email, DEMO.owner.password);
  const snapshot = (await (await owner.get("/api/office/settings")).json()) as { values: Record<string, unknown>; version: number };
  settingsBase = { ...snapshot.values, version: snapshot.version + 1000 };
  own = await ownRows();
}, 120_000);

afterAll(async () => {
  await stopQueue();
});

// ---- The suites ---------------------------------------------------------------------------------------

const BODY_ROUTES = ROUTES.filter((r) => r.method !== "GET" && !r.route.startsWith("/api/auth/"));

describe("random JSON bodies on every route that takes one", () => {
  it("has a body shape for each of them", () => {
    expect(BODY_ROUTES.map(key).filter((k) => !SHAPES[k])).toEqual([]);
  });

  for (const entry of BODY_ROUTES) {
    it(`${key(entry)} as ${roleFor(entry)}`, async () => {
      const f = fixturesFor(entry);
      const kind = kindOf(entry);
      const client = clientFor(roleFor(entry));
      let path = pathOf(entry, f);
      const headers: Record<string, string> = {};
      if (kind === "upload") {
        path += "?actionType=upload&slug=quotePhotos";
        Object.assign(headers, { "x-uploadthing-package": "bandedge-tests", "x-uploadthing-version": "7.7.4" });
      }
      if (kind === "webhook") headers["stripe-signature"] = `t=${Math.floor(Date.now() / 1000)},v1=${"0".repeat(64)}`;
      const seen = new Set<number>();
      await fc.assert(
        fc.asyncProperty(bodyArbitrary(shapeFor(entry), f), async (text) => {
          const answer = await send(client, entry.method, path, text, headers);
          seen.add(answer.status);
          const problem = problemOf(kind, answer);
          if (problem) throw new Error(`${key(entry)} with body ${text.slice(0, 300)}: ${problem}`);
        }),
        { numRuns: RUNS, endOnFailure: true },
      );
      // Values a database column cannot hold, in each field of a valid body, one at a time: a NUL character
      // in text, integers beyond 32 bits, a double near its limit.
      const shape = shapeFor(entry);
      if (shape.base) {
        for (const field of shape.fields) {
          for (const value of UNSTORABLE) {
            const body = { ...shape.base(f), [field]: value };
            const answer = await send(client, entry.method, path, JSON.stringify(body), headers);
            seen.add(answer.status);
            expect(problemOf(kind, answer), `${key(entry)} with ${JSON.stringify(value)} in "${field}"`).toBeNull();
          }
        }
      }
      // Some of the random bodies were refused: the checks above saw real 4xx answers, not only successes.
      expect(
        [...seen].some((s) => s >= 400 && s < 500),
        `${key(entry)} never refused anything (${[...seen]})`,
      ).toBe(true);
      await expectUnpolluted(key(entry));
    });
  }
});

const fuzzSignInEmail = `fuzz-signin-${randomUUID().slice(0, 8)}@example.com`;

describe("random bodies on sign-in and sign-up (each from its own client address)", () => {
  const auth = [
    {
      path: "/api/auth/sign-in/email",
      fields: ["email", "password", "rememberMe", "callbackURL"],
      // An e-mail of its own per run: hundreds of wrong passwords would trip a demo account's failure throttle.
      base: () => ({ email: fuzzSignInEmail, password: "not-the-password" }),
    },
    {
      path: "/api/auth/sign-up/email",
      fields: ["name", "email", "password", "callbackURL", "role", "emailVerified", "banned", "image"],
      base: () => ({
        name: "Fuzz Sign-up",
        email: `fuzz-signup-${randomUUID().slice(0, 8)}@example.com`,
        password: "heterodyne-whistle-42",
        callbackURL: "/portal",
      }),
    },
  ];
  for (const a of auth) {
    it(`POST ${a.path}`, async () => {
      await fc.assert(
        fc.asyncProperty(bodyArbitrary({ fields: a.fields, base: a.base }, own.fallback), async (text) => {
          const answer = await send(new TestClient(), "POST", a.path, text);
          const problem = problemOf("auth", answer);
          if (problem) throw new Error(`${a.path} with body ${text.slice(0, 300)}: ${problem}`);
        }),
        { numRuns: RUNS, endOnFailure: true },
      );
      for (const field of a.fields) {
        for (const value of UNSTORABLE) {
          const answer = await send(new TestClient(), "POST", a.path, JSON.stringify({ ...a.base(), [field]: value }));
          expect(problemOf("auth", answer), `${a.path} with ${JSON.stringify(value)} in "${field}"`).toBeNull();
        }
      }
      await expectUnpolluted(a.path);
    });
  }

  it("never lets a sign-up body choose a role, a verified address or a ban state", async () => {
    const email = `fuzz-signup-${randomUUID().slice(0, 8)}@example.com`;
    const text = `{"__proto__":${JSON.stringify(POLLUTION)},"name":"Mass Assignment","email":"${email}","password":"heterodyne-whistle-42","role":"owner","emailVerified":true,"banned":false}`;
    const answer = await send(new TestClient(), "POST", "/api/auth/sign-up/email", text);
    expect(problemOf("auth", answer)).toBeNull();
    const rows = await sql<{ role: string; email_verified: boolean }>(`select role, email_verified from "user" where email = $1`, [email]);
    for (const r of rows) expect(r).toEqual({ role: "customer", email_verified: false });
    const all = await sql<{ n: number }>(
      `select count(*)::int as n from "user" where email like 'fuzz-signup-%' and (role <> 'customer' or email_verified)`,
    );
    expect(all[0]!.n).toBe(0);
  });
});

describe("prototype pollution", () => {
  it("leaves the server's objects alone after bodies full of __proto__ and constructor.prototype keys", async () => {
    const bodies = [
      `{"__proto__":${JSON.stringify(POLLUTION)}}`,
      `{"constructor":{"prototype":${JSON.stringify(POLLUTION)}}}`,
      `{"body":"prototype probe","idempotencyKey":"${randomUUID()}","__proto__":${JSON.stringify(POLLUTION)}}`,
      `{"profile":{"__proto__":${JSON.stringify(POLLUTION)}},"maker":"Aurelian","model":"5T","year":1948}`,
      `[{"__proto__":${JSON.stringify(POLLUTION)}}]`,
    ];
    const targets: { client: TestClient; method: string; path: string }[] = [
      { client: customer.client, method: "POST", path: `/api/portal/jobs/${own.fallback.jobOpenA}/messages` },
      { client: customer.client, method: "POST", path: "/api/portal/jobs" },
      { client: tech, method: "PUT", path: `/api/bench/jobs/${own.fallback.jobOpenA}/profile` },
      { client: tech, method: "POST", path: "/api/tools/estimate" },
      { client: tech, method: "POST", path: "/api/tools/alignment" },
      { client: tech, method: "POST", path: "/api/tools/dial-fit" },
      { client: owner, method: "PUT", path: "/api/office/settings" },
      { client: new TestClient(), method: "POST", path: "/api/auth/sign-in/email" },
      { client: new TestClient(), method: "POST", path: "/api/auth/sign-up/email" },
    ];
    for (const t of targets) {
      for (const body of bodies) {
        const answer = await send(t.client, t.method, t.path, body);
        expect(problemOf(t.path.startsWith("/api/auth/") ? "auth" : "app", answer), `${t.method} ${t.path} ${body}`).toBeNull();
      }
    }
    await expectUnpolluted("after the prototype bodies");
    // A queue request that names no filter still sees every open job the default way.
    const res = await tech.get("/api/bench/queue?pageSize=100");
    const q = (await res.json()) as { rows: { id: string }[] };
    expect(q.rows.length).toBeGreaterThan(0);
    // The message with the prototype key was stored as a plain message of the customer's, nothing more.
    const [m] = await sql<{ author_id: string; internal: boolean }>(
      "select author_id, internal from message where body = 'prototype probe' order by created_at desc limit 1",
    );
    expect(m).toEqual({ author_id: customer.id, internal: false });
  });
});

describe("random query strings on the routes that read one", () => {
  const reads: { role: "technician" | "owner" | "customerA"; path: string; params: string[] }[] = [
    {
      role: "technician",
      path: "/api/bench/queue",
      params: ["page", "pageSize", "sort", "dir", "states", "technician", "q", "includeClosed"],
    },
    { role: "owner", path: "/api/office/audit", params: ["actor", "entity", "action", "from", "to", "page"] },
    { role: "owner", path: "/api/office/reports", params: ["from", "to"] },
    { role: "owner", path: "/api/office/payments", params: ["page", "status"] },
    { role: "owner", path: "/api/office/exports/payments.csv", params: ["from", "to"] },
    { role: "owner", path: "/api/office/exports/audit.csv", params: ["from", "to"] },
  ];
  const value = fc.oneof(
    nastyStrings,
    numbers.map(String),
    fc.string({ maxLength: 30 }),
    fc.constantFrom("in_triage,on_bench", "me", "none", "asc", "desc", "2026-01", "2026-01-01", "paid", "1", "0"),
    huge.map((s) => s.slice(0, 300)),
  );
  for (const r of reads) {
    it(`GET ${r.path}`, async () => {
      const client = clientFor(r.role);
      await fc.assert(
        // Bounded so the URL stays under the HTTP server's header limit (that 431 is not the app's answer).
        fc.asyncProperty(
          fc.array(fc.tuple(fc.oneof(fc.constantFrom(...r.params), nastyStrings), value), { maxLength: 4 }),
          async (pairs) => {
            const qs = new URLSearchParams(pairs as [string, string][]).toString();
            const answer = await send(client, "GET", `${r.path}?${qs}`, "");
            const problem = problemOf("app", answer);
            if (problem) throw new Error(`GET ${r.path}?${qs}: ${problem}`);
          },
        ),
        { numRuns: 25, endOnFailure: true },
      );
      for (const param of r.params) {
        const answer = await send(client, "GET", `${r.path}?${new URLSearchParams({ [param]: "before\u0000after" })}`, "");
        expect(problemOf("app", answer), `GET ${r.path} with a NUL character in "${param}"`).toBeNull();
      }
    });
  }
});

describe("duplicate query parameters", () => {
  const cases: { role: "technician" | "owner" | "customerA"; path: string; last: string }[] = [
    { role: "technician", path: "/api/bench/queue?page=1&page=2", last: "/api/bench/queue?page=2" },
    { role: "technician", path: "/api/bench/queue?states=in_triage&states=on_bench", last: "/api/bench/queue?states=on_bench" },
    { role: "technician", path: "/api/bench/queue?state=in_triage&state=on_bench", last: "/api/bench/queue?state=on_bench" },
    { role: "technician", path: "/api/bench/queue?sort=number&sort=bogus", last: "/api/bench/queue?sort=bogus" },
    { role: "technician", path: "/api/bench/queue?pageSize=5&pageSize=10&dir=asc&dir=desc", last: "/api/bench/queue?pageSize=10&dir=desc" },
    { role: "owner", path: "/api/office/audit?page=1&page=2", last: "/api/office/audit?page=2" },
    { role: "owner", path: "/api/office/audit?from=2026-01-01&from=not-a-day", last: "/api/office/audit?from=not-a-day" },
    {
      role: "owner",
      path: "/api/office/audit?entity=job&entity=payment&action=x&action=job.transition",
      last: "/api/office/audit?entity=payment&action=job.transition",
    },
    { role: "owner", path: "/api/office/payments?status=paid&status=open", last: "/api/office/payments?status=open" },
    { role: "owner", path: "/api/office/reports?from=2026-01&from=2026-02", last: "/api/office/reports?from=2026-02" },
  ];
  for (const c of cases) {
    it(`GET ${c.path}`, async () => {
      const client = clientFor(c.role);
      // Other suites may write between two reads (a new job, an audit row): a trio of reads is compared, and
      // a trio disturbed by such a write is read again (at most three times).
      let trio: Sent[] = [];
      for (let attempt = 0; attempt < 3; attempt++) {
        trio = [await send(client, "GET", c.path, ""), await send(client, "GET", c.path, ""), await send(client, "GET", c.last, "")];
        for (const a of trio) {
          expect(problemOf("app", a), c.path).toBeNull();
          expect([200, 400], `${c.path}: ${a.text.slice(0, 200)}`).toContain(a.status);
        }
        if (trio[0]!.text === trio[1]!.text && trio[1]!.text === trio[2]!.text) break;
      }
      const [first, second, single] = trio as [Sent, Sent, Sent];
      // The same answer each time, and the same as naming the parameter once (the last value counts).
      expect(second).toEqual(first);
      expect(single.status).toBe(first.status);
      expect(JSON.parse(single.text)).toEqual(JSON.parse(first.text));
    });
  }

  it("GET /api/photos/[id] with ?size twice answers the same bytes each time", async () => {
    const path = `/api/photos/${own.fallback.photoA}?size=thumb&size=full`;
    const a = await customer.client.get(path);
    const b = await customer.client.get(path);
    expect(a.status).toBe(200);
    expect(b.status).toBe(200);
    expect(Buffer.from(await a.arrayBuffer()).equals(Buffer.from(await b.arrayBuffer()))).toBe(true);
  });
});
