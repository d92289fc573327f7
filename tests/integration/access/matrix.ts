// The authorization matrix: every route handler and server action, who may call it, and whose data it is.
// tests/integration/access.test.ts checks each entry for every role, and fails when the app has a route
// or action that is not listed here.
//
//   allow — gets past authorization (any answer but 401, 403 or 404, and never a 5xx)
//   deny  — anonymous gets 401, anyone signed in gets 404 (existence is not revealed)
//   own   — allowed for the customer whose resource it is (customer A); customer B gets 404
//   public — no session needed (the answer is the route's own business)

import { randomUUID } from "node:crypto";

export type Role = "anonymous" | "customerA" | "customerB" | "technician" | "owner";
export type Rule = "allow" | "deny" | "own" | "public";
export type Fixtures = {
  jobA: string;
  revisionA: string;
  certificateA: string;
  claimA: string;
  paymentA: string;
  sessionA: string;
  photoA: string;
  jobOpenA: string;
  refundAny: string;
  emailAny: string;
  /** An instrument some reading names: deleting it is refused, so the probes leave it in place. */
  instrumentAny: string;
  /** Customer A's address. */
  addressA: string;
  /** More of customer A's addresses, one taken by each removal probe (a removed address is gone). */
  addressSparesA: string[];
  partAny: string;
  /** The receipt of customer A's deposit. */
  documentA: string;
};

export type RouteEntry = {
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  route: string; // as the file lives under app/, e.g. /api/portal/jobs/[id]
  action: string;
  rules: Record<Role, Rule>;
  params?: (f: Fixtures) => Record<string, string>;
  body?: (f: Fixtures) => unknown;
  query?: string;
  /** Routes that do not tell visitors they exist answer them 404 instead of asking them to sign in. */
  hiddenFromVisitors?: boolean;
};

const staff = (rule: Rule = "allow"): Record<Role, Rule> => ({
  anonymous: "deny",
  customerA: "deny",
  customerB: "deny",
  technician: rule,
  owner: rule,
});
const ownerOnly: Record<Role, Rule> = { anonymous: "deny", customerA: "deny", customerB: "deny", technician: "deny", owner: "allow" };
const customers: Record<Role, Rule> = { anonymous: "deny", customerA: "allow", customerB: "allow", technician: "deny", owner: "deny" };
const customerOwn: Record<Role, Rule> = { anonymous: "deny", customerA: "own", customerB: "own", technician: "deny", owner: "deny" };
const ownOrStaff: Record<Role, Rule> = { anonymous: "deny", customerA: "own", customerB: "own", technician: "allow", owner: "allow" };
const ownOrOffice: Record<Role, Rule> = { anonymous: "deny", customerA: "own", customerB: "own", technician: "deny", owner: "allow" };
const everyone: Record<Role, Rule> = {
  anonymous: "public",
  customerA: "public",
  customerB: "public",
  technician: "public",
  owner: "public",
};

const job = (f: Fixtures) => ({ id: f.jobOpenA });
const jobDone = (f: Fixtures) => ({ id: f.jobA });

export const ROUTES: RouteEntry[] = [
  { method: "GET", route: "/api/auth/[...all]", action: "auth", rules: everyone, params: () => ({ all: "get-session" }) },
  {
    method: "POST",
    route: "/api/auth/[...all]",
    action: "auth",
    rules: everyone,
    params: () => ({ all: "sign-in/email" }),
    body: () => ({}),
  },
  { method: "GET", route: "/api/health", action: "health", rules: everyone },
  {
    method: "GET",
    route: "/verify/[code]",
    action: "certificate check (public)",
    rules: everyone,
    params: () => ({ code: "KL-NOPE-0000" }),
  },
  { method: "GET", route: "/api/ready", action: "readiness (touches the database)", rules: everyone },
  {
    method: "POST",
    route: "/api/staff-invitations/accept",
    action: "staff.invitation.accept (single-use token, not session)",
    rules: everyone,
    body: () => ({ token: "not-a-real-invitation", password: "valve-glow-1948-x" }),
  },
  {
    method: "POST",
    route: "/api/webhooks/stripe",
    action: "payment.webhook (signature, not session)",
    rules: everyone,
    body: () => ({ id: "evt_unsigned", type: "checkout.session.completed" }),
  },
  { method: "GET", route: "/api/uploadthing", action: "upload.config", rules: everyone },
  {
    method: "POST",
    route: "/api/uploadthing",
    action: "upload.photo (session checked by the upload router)",
    rules: everyone,
    body: () => ({}),
  },

  { method: "GET", route: "/api/portal/jobs", action: "portal.use", rules: customers },
  { method: "POST", route: "/api/portal/jobs", action: "quote.request", rules: customers, body: () => ({}) },
  { method: "GET", route: "/api/portal/jobs/[id]", action: "job.read (own)", rules: customerOwn, params: job },
  { method: "GET", route: "/api/portal/jobs/[id]/messages", action: "message.read (own)", rules: customerOwn, params: job },
  {
    method: "POST",
    route: "/api/portal/jobs/[id]/messages",
    action: "message.post (own)",
    rules: customerOwn,
    params: job,
    body: () => ({ body: "Access probe: is the set on the bench yet?", idempotencyKey: randomUUID() }),
  },
  {
    method: "POST",
    route: "/api/portal/jobs/[id]/messages/read",
    action: "message.read (own)",
    rules: customerOwn,
    params: job,
    // A message id not on the thread: the owner of the job gets past authorization to a 400 on the field.
    body: () => ({ lastMessageId: randomUUID() }),
  },
  {
    method: "POST",
    route: "/api/portal/jobs/[id]/estimate/approve",
    action: "estimate.approve (own)",
    rules: customerOwn,
    params: jobDone,
    body: (f) => ({ revisionId: f.revisionA }),
  },
  {
    method: "POST",
    route: "/api/portal/jobs/[id]/estimate/decline",
    action: "estimate.approve (own)",
    rules: customerOwn,
    params: jobDone,
    body: (f) => ({ revisionId: f.revisionA, reason: "Access probe: more than I can spend." }),
  },
  {
    method: "POST",
    route: "/api/portal/jobs/[id]/withdraw",
    action: "quote.withdraw (own)",
    rules: customerOwn,
    params: jobDone,
    body: () => ({ reason: "Access probe: changed my mind." }),
  },
  { method: "GET", route: "/api/portal/account", action: "account.manage", rules: customers },
  { method: "PATCH", route: "/api/portal/account", action: "account.manage", rules: customers, body: () => ({}) },
  { method: "GET", route: "/api/portal/account/addresses", action: "account.manage", rules: customers },
  { method: "POST", route: "/api/portal/account/addresses", action: "account.manage", rules: customers, body: () => ({}) },
  {
    method: "PATCH",
    route: "/api/portal/account/addresses/[id]",
    action: "account.manage (own)",
    rules: customerOwn,
    params: (f) => ({ id: f.addressA }),
    // A valid body, so another owner's answer is the 404 of the address and not the 400 of the form.
    body: () => ({
      recipient: "Mira Holloway",
      line1: "14 Kestrel Lane",
      city: "Port Alder",
      region: "ME",
      postalCode: "04101",
      country: "US",
    }),
  },
  {
    method: "DELETE",
    route: "/api/portal/account/addresses/[id]",
    action: "account.manage (own)",
    rules: customerOwn,
    params: (f) => ({ id: f.addressSparesA.shift() ?? f.addressA }),
  },
  // An empty body: the password is never given, so no probe closes an account.
  { method: "POST", route: "/api/portal/account/close", action: "account.manage", rules: customers, body: () => ({}) },
  {
    method: "PUT",
    route: "/api/portal/jobs/[id]/return-address",
    action: "account.manage (own job, own address)",
    rules: customerOwn,
    params: job,
    body: (f) => ({ addressId: f.addressA }),
  },
  {
    method: "GET",
    route: "/api/payments/[paymentId]",
    action: "payment.read (own)",
    rules: customerOwn,
    params: (f) => ({ paymentId: f.paymentA }),
  },
  {
    method: "POST",
    route: "/api/payments/checkout",
    action: "payment.start (own)",
    rules: customerOwn,
    body: (f) => ({ jobId: f.jobA, purpose: "deposit" }),
  },
  {
    method: "GET",
    route: "/api/payments/session/[sessionId]",
    action: "payment.read (own)",
    rules: customerOwn,
    params: (f) => ({ sessionId: f.sessionA }),
  },
  { method: "GET", route: "/api/photos/[id]", action: "photo.view (own or staff)", rules: ownOrStaff, params: (f) => ({ id: f.photoA }) },

  {
    method: "GET",
    route: "/api/certificates/[id]/pdf",
    action: "certificate.download (own or staff)",
    rules: ownOrStaff,
    params: (f) => ({ id: f.certificateA }),
  },
  {
    method: "POST",
    route: "/api/certificates/[id]/revoke",
    action: "certificate.revoke",
    rules: ownerOnly,
    params: (f) => ({ id: f.certificateA }),
    body: () => ({}),
  },
  {
    method: "POST",
    route: "/api/certificates/[id]/reissue",
    action: "certificate.reissue",
    rules: ownerOnly,
    params: (f) => ({ id: f.certificateA }),
    body: () => ({}),
  },
  { method: "GET", route: "/api/claims", action: "claim.list (own)", rules: customers },
  {
    method: "POST",
    route: "/api/claims",
    action: "claim.open (own certificate)",
    rules: customerOwn,
    body: (f) => ({
      certificateId: f.certificateA,
      symptomCategory: "hum",
      description: "Hum came back after an hour.",
      statements: [],
      photos: [],
    }),
  },
  { method: "POST", route: "/api/claims/by-code", action: "claim.open (by code, as the terms allow)", rules: customers, body: () => ({}) },
  {
    method: "POST",
    route: "/api/claims/[id]/decision",
    action: "claim.decide",
    rules: staff(),
    params: (f) => ({ id: f.claimA }),
    body: () => ({}),
  },

  { method: "GET", route: "/api/bench/queue", action: "bench.use", rules: staff(), query: "?page=1" },
  { method: "GET", route: "/api/bench/parts", action: "estimate.edit", rules: staff(), query: "?q=cap" },
  { method: "GET", route: "/api/bench/staff", action: "bench.use", rules: staff() },
  // Counter and phone intake: staff only; an empty body gets past authorization and is refused as bad input.
  { method: "POST", route: "/api/bench/intake", action: "job.intake", rules: staff(), body: () => ({}) },
  { method: "GET", route: "/api/bench/customers", action: "job.intake", rules: staff(), query: "?q=holloway" },
  { method: "POST", route: "/api/bench/jobs/[id]/decision", action: "decision.record", rules: staff(), params: job, body: () => ({}) },
  { method: "GET", route: "/api/bench/jobs/[id]", action: "bench.use", rules: staff(), params: job },
  { method: "GET", route: "/api/bench/jobs/[id]/sheet", action: "bench.use", rules: staff(), params: job },
  {
    method: "POST",
    route: "/api/bench/jobs/[id]/assign",
    action: "job.assign",
    rules: staff(),
    params: job,
    body: () => ({ technicianId: 12 }),
  },
  { method: "POST", route: "/api/bench/jobs/[id]/triage", action: "job.triage", rules: staff(), params: jobDone, body: () => ({}) },
  { method: "PUT", route: "/api/bench/jobs/[id]/profile", action: "job.triage", rules: staff(), params: job, body: () => ({}) },
  { method: "POST", route: "/api/bench/jobs/[id]/question", action: "job.triage", rules: staff(), params: job, body: () => ({}) },
  { method: "POST", route: "/api/bench/jobs/[id]/decline", action: "job.triage", rules: staff(), params: job, body: () => ({}) },
  { method: "GET", route: "/api/bench/jobs/[id]/estimate", action: "estimate.edit", rules: staff(), params: job },
  { method: "PUT", route: "/api/bench/jobs/[id]/estimate", action: "estimate.edit", rules: staff(), params: job, body: () => ({}) },
  {
    method: "POST",
    route: "/api/bench/jobs/[id]/estimate/rebuild",
    action: "estimate.edit",
    rules: staff(),
    params: job,
    body: () => ({}),
  },
  {
    method: "POST",
    route: "/api/bench/jobs/[id]/estimate/send",
    action: "estimate.send",
    rules: staff(),
    params: jobDone,
    body: () => ({}),
  },
  {
    method: "POST",
    route: "/api/bench/jobs/[id]/start-bench",
    action: "reading.record",
    rules: staff(),
    params: jobDone,
    body: () => ({}),
  },
  { method: "POST", route: "/api/bench/jobs/[id]/readings", action: "reading.record", rules: staff(), params: job, body: () => ({}) },
  { method: "PUT", route: "/api/bench/jobs/[id]/performance", action: "reading.record", rules: staff(), params: job, body: () => ({}) },
  { method: "POST", route: "/api/bench/jobs/[id]/passband", action: "reading.record", rules: staff(), params: job, body: () => ({}) },
  { method: "POST", route: "/api/bench/jobs/[id]/tasks", action: "reading.record", rules: staff(), params: job, body: () => ({}) },
  { method: "POST", route: "/api/bench/jobs/[id]/notes", action: "bench.use", rules: staff(), params: job, body: () => ({}) },
  { method: "GET", route: "/api/bench/jobs/[id]/messages", action: "bench.use", rules: staff(), params: job },
  { method: "POST", route: "/api/bench/jobs/[id]/messages", action: "bench.use", rules: staff(), params: job, body: () => ({}) },
  {
    method: "POST",
    route: "/api/bench/jobs/[id]/messages/read",
    action: "bench.use",
    rules: staff(),
    params: job,
    body: () => ({ lastMessageId: randomUUID() }),
  },
  { method: "POST", route: "/api/bench/jobs/[id]/final-checks", action: "job.complete", rules: staff(), params: jobDone, body: () => ({}) },
  {
    method: "POST",
    route: "/api/bench/jobs/[id]/back-to-bench",
    action: "job.complete",
    rules: staff(),
    params: jobDone,
    body: () => ({}),
  },
  { method: "POST", route: "/api/bench/jobs/[id]/complete", action: "job.complete", rules: staff(), params: jobDone, body: () => ({}) },
  { method: "POST", route: "/api/bench/jobs/[id]/return", action: "job.return", rules: staff(), params: jobDone, body: () => ({}) },
  {
    method: "POST",
    route: "/api/bench/jobs/[id]/cancel",
    action: "job.cancel",
    rules: ownerOnly,
    params: jobDone,
    body: () => ({ reason: "Access probe: not going ahead." }),
  },
  { method: "POST", route: "/api/tools/alignment", action: "tools.use", rules: staff(), body: () => ({}) },
  { method: "POST", route: "/api/tools/estimate", action: "tools.use", rules: staff(), body: () => ({}) },
  { method: "POST", route: "/api/tools/dial-fit", action: "tools.use", rules: staff(), body: () => ({}) },

  { method: "GET", route: "/api/office/settings", action: "settings.edit", rules: ownerOnly },
  { method: "PUT", route: "/api/office/settings", action: "settings.edit", rules: ownerOnly, body: () => ({}) },
  { method: "GET", route: "/api/office/audit", action: "audit.read", rules: ownerOnly },
  { method: "GET", route: "/api/office/reports", action: "reports.read", rules: ownerOnly },
  {
    method: "GET",
    route: "/api/office/exports/[file]",
    action: "exports.download",
    rules: ownerOnly,
    params: () => ({ file: "payments.csv" }),
    query: "?from=2026-01-01&to=2026-12-31",
    hiddenFromVisitors: true,
  },
  { method: "GET", route: "/api/office/payments", action: "payment.refund", rules: ownerOnly },
  {
    method: "GET",
    route: "/api/documents/[id]/pdf",
    action: "document.download (own job's, or the office)",
    rules: ownOrOffice,
    params: (f) => ({ id: f.documentA }),
    hiddenFromVisitors: true,
  },
  {
    method: "GET",
    route: "/api/documents/estimates/[jobId]/pdf",
    action: "document.download (own job's, or the office)",
    rules: ownOrOffice,
    params: (f) => ({ jobId: f.jobA }),
    hiddenFromVisitors: true,
  },
  { method: "POST", route: "/api/office/payments/manual", action: "payment.record", rules: ownerOnly, body: () => ({}) },
  {
    method: "POST",
    route: "/api/office/payments/[paymentId]/void",
    action: "payment.record",
    rules: ownerOnly,
    params: (f) => ({ paymentId: f.paymentA }),
    body: () => ({}),
  },
  {
    method: "GET",
    route: "/api/office/payments/[paymentId]",
    action: "payment.refund",
    rules: ownerOnly,
    params: (f) => ({ paymentId: f.paymentA }),
  },
  {
    method: "POST",
    route: "/api/office/payments/[paymentId]/refunds",
    action: "payment.refund",
    rules: ownerOnly,
    params: (f) => ({ paymentId: f.paymentA }),
    body: () => ({}),
  },
  {
    method: "POST",
    route: "/api/office/refunds/[refundId]/check",
    action: "payment.refund",
    rules: ownerOnly,
    params: (f) => ({ refundId: f.refundAny }),
    body: () => ({}),
  },
  { method: "GET", route: "/api/office/emails", action: "email.resend", rules: ownerOnly },
  { method: "GET", route: "/api/office/instruments", action: "instrument.manage", rules: ownerOnly },
  { method: "POST", route: "/api/office/instruments", action: "instrument.manage", rules: ownerOnly, body: () => ({}) },
  {
    method: "PATCH",
    route: "/api/office/instruments/[id]",
    action: "instrument.manage",
    rules: ownerOnly,
    params: (f) => ({ id: f.instrumentAny }),
    body: () => ({}),
  },
  // One's own notifications and choices: every staff role; the ids are only ever one's own (a random id is 404).
  { method: "GET", route: "/api/staff/notifications", action: "notifications.use (own)", rules: staff() },
  { method: "GET", route: "/api/staff/notifications/unread", action: "notifications.use (own)", rules: staff() },
  {
    method: "POST",
    route: "/api/staff/notifications/read-all",
    action: "notifications.use (own)",
    rules: staff(),
    body: () => ({}),
  },
  {
    method: "POST",
    route: "/api/staff/notifications/[id]/read",
    action: "notifications.use (own)",
    // An id that is nobody's: staff get past authorization to a 404 of the data, checked in notifications.test.ts.
    rules: { anonymous: "deny", customerA: "deny", customerB: "deny", technician: "deny", owner: "deny" },
    params: () => ({ id: randomUUID() }),
    body: () => ({ read: true }),
  },
  { method: "GET", route: "/api/staff/notification-preferences", action: "notifications.use (own)", rules: staff() },
  {
    method: "PUT",
    route: "/api/staff/notification-preferences",
    action: "notifications.use (own)",
    rules: staff(),
    // Not a full set of choices: staff get past authorization to a 400, and nobody's choices change.
    body: () => ({ preferences: {} }),
  },
  {
    method: "DELETE",
    route: "/api/office/instruments/[id]",
    action: "instrument.manage",
    rules: ownerOnly,
    params: (f) => ({ id: f.instrumentAny }),
  },
  { method: "GET", route: "/api/office/parts", action: "parts.manage", rules: ownerOnly },
  { method: "POST", route: "/api/office/parts", action: "parts.manage", rules: ownerOnly, body: () => ({}) },
  {
    method: "PATCH",
    route: "/api/office/parts/[id]",
    action: "parts.manage",
    rules: ownerOnly,
    params: (f) => ({ id: f.partAny }),
    body: () => ({}),
  },
  {
    method: "DELETE",
    route: "/api/office/parts/[id]",
    action: "parts.manage",
    rules: ownerOnly,
    params: (f) => ({ id: f.partAny }),
  },
  {
    method: "POST",
    route: "/api/office/emails/[emailId]/resend",
    action: "email.resend",
    rules: ownerOnly,
    params: (f) => ({ emailId: f.emailAny }),
    body: () => ({}),
  },
];

// Server actions: the permission each is wrapped with, and the roles that permission must grant.
export const ACTIONS: { file: string; name: string; permission: string; roles: Role[] }[] = [
  { file: "app/(office)/office/staff/actions.ts", name: "inviteStaff", permission: "staff.manage", roles: ["owner"] },
  { file: "app/(office)/office/staff/actions.ts", name: "changeStaffRole", permission: "staff.manage", roles: ["owner"] },
  { file: "app/(office)/office/staff/actions.ts", name: "setStaffActive", permission: "staff.manage", roles: ["owner"] },
  { file: "app/(office)/office/staff/bench-time-actions.ts", name: "saveBenchWeek", permission: "staff.manage", roles: ["owner"] },
];

// Every page, who may open it, and the ids of pages with a parameter. "local-demo" pages exist only in the
// local-demo mode (npm start and the test command); tests/integration/local-demo.test.ts shows they are not
// found anywhere else. Expected answers: allow — 200; deny — anonymous is sent to sign-in, anyone else
// signed in gets 404 or is sent to their own home; public — 200 for everyone.
export type PageEntry = { route: string; rules: Record<Role, Rule>; params?: (f: Fixtures) => Record<string, string> };
const pageStaff: Record<Role, Rule> = staff();
export const PAGES: PageEntry[] = [
  { route: "/", rules: everyone },
  { route: "/sign-in", rules: everyone },
  { route: "/sign-up", rules: everyone },
  { route: "/reset-password", rules: everyone },
  { route: "/welcome", rules: everyone },
  { route: "/verify", rules: everyone },
  // Rendered by the app for itself; anyone else is sent on to /verify/[code].
  { route: "/verify/[code]/sheet", rules: everyone, params: () => ({ code: "KL-NOPE-0000" }) },
  { route: "/after-sign-in", rules: { anonymous: "deny", customerA: "allow", customerB: "allow", technician: "allow", owner: "allow" } },
  { route: "/mailbox", rules: everyone },
  { route: "/portal", rules: customers },
  { route: "/portal/request", rules: customers },
  { route: "/portal/claims", rules: customers },
  { route: "/portal/account", rules: customers },
  { route: "/portal/claims/new", rules: customers },
  { route: "/portal/claims/[id]", rules: customerOwn, params: (f) => ({ id: f.claimA }) },
  { route: "/portal/jobs/[id]", rules: customerOwn, params: (f) => ({ id: f.jobA }) },
  { route: "/portal/jobs/[id]/payment", rules: customerOwn, params: (f) => ({ id: f.jobOpenA }) },
  { route: "/bench", rules: pageStaff },
  { route: "/bench/calculator", rules: pageStaff },
  { route: "/bench/intake", rules: pageStaff },
  { route: "/bench/claims", rules: pageStaff },
  { route: "/bench/claims/[id]", rules: pageStaff, params: (f) => ({ id: f.claimA }) },
  { route: "/bench/jobs/[id]", rules: pageStaff, params: (f) => ({ id: f.jobOpenA }) },
  { route: "/staff/notifications", rules: pageStaff },
  { route: "/staff/profile", rules: pageStaff },
  { route: "/office", rules: ownerOnly },
  { route: "/office/audit", rules: ownerOnly },
  { route: "/office/certificates", rules: ownerOnly },
  { route: "/office/payments", rules: ownerOnly },
  { route: "/office/payments/[paymentId]", rules: ownerOnly, params: (f) => ({ paymentId: f.paymentA }) },
  { route: "/office/reports", rules: ownerOnly },
  { route: "/office/settings", rules: ownerOnly },
  { route: "/office/staff", rules: ownerOnly },
  { route: "/office/instruments", rules: ownerOnly },
  { route: "/office/parts", rules: ownerOnly },
];
/** Pages that exist only in the local-demo mode. */
export const LOCAL_DEMO_PAGES = new Set(["/mailbox"]);
