// Staff notifications through the real routes: each event (a quote request, an owner's message, an estimate
// decision, a payment, a refund settling, a warranty claim) tells the technician holding the job, else the
// shop owner; never the person who caused it, never a deactivated account; each person's choices decide the
// channels; a redelivered payment event tells nobody twice; one's notifications are one's own (404 otherwise).
// The rules are the shop's own, written as common practice in DEVELOPERS.md ("Staff notifications"); the
// webhook's at-least-once delivery is Stripe's documented contract ("Handle duplicate events", Stripe docs).
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import type { TestClient } from "../support/http";
import { listMail, waitForMail } from "../support/mail";
import { jpeg } from "../fixtures/images";
import { seedJobWithEstimate } from "../fixtures/jobs";
import { deliver, payOnStandin, sessionIdFrom, stripeClient, waitForEvent } from "../fixtures/stripe";
import { quoteBody, ticketFor } from "../fixtures/uploads";
import { createJob, userId } from "./bench-fixtures";
import { createCertificate, IDS, stopQueue } from "./certificates-fixtures";

type Item = { id: string; kind: string; title: string; body: string; href: string; read: boolean };
type List = { items: Item[]; unread: number };

let owner: TestClient; // the shop owner (Odile)
let tech: TestClient; // Tomas
let tech2: TestClient; // Priya
const ids = { owner: "", tech: "", tech2: "" };

beforeAll(async () => {
  [owner, tech, tech2] = await Promise.all([signedIn(DEMO.owner), signedIn(DEMO.tech), signedIn(DEMO.tech2)]);
  ids.owner = await userId(DEMO.owner.email);
  ids.tech = await userId(DEMO.tech.email);
  ids.tech2 = await userId(DEMO.tech2.email);
});
afterAll(async () => {
  // Back to the defaults for anyone else using the demo accounts.
  await sql("delete from notification_preference where user_id = any($1)", [[ids.owner, ids.tech, ids.tech2]]);
  await stopQueue();
  await closeTestPool();
});

async function rowsFor(key: string) {
  return sql<{ recipient_id: string; kind: string; title: string; body: string; job_id: string | null; claim_id: string | null }>(
    "select recipient_id, kind, title, body, job_id, claim_id from notification where dedupe_key = $1 order by recipient_id",
    [key],
  );
}
const recipientsOf = async (key: string) => (await rowsFor(key)).map((r) => r.recipient_id).sort();

async function listOf(client: TestClient): Promise<List> {
  const res = await client.get("/api/staff/notifications");
  expect(res.status).toBe(200);
  return (await res.json()) as List;
}

async function waitFor<T>(fn: () => Promise<T>, ok: (v: T) => boolean, timeoutMs = 20_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let last = await fn();
  while (!ok(last) && Date.now() < deadline) {
    await new Promise((r) => setTimeout(r, 250));
    last = await fn();
  }
  return last;
}

const ownerMessage = (client: TestClient, jobId: string, body: string) =>
  client.post(`/api/portal/jobs/${jobId}/messages`, { body, idempotencyKey: randomUUID() });

describe("a new quote request", () => {
  it("goes to the shop owner in the app and by e-mail (on by default), to no technician and not to the set owner", async () => {
    const customer = await newCustomer("notify-quote");
    const ticket = await ticketFor(customer.client, { name: "front.jpg", type: "image/jpeg", bytes: await jpeg() });
    const res = await customer.client.post("/api/portal/jobs", quoteBody([ticket], { model: "5T-48 notify" }));
    expect(res.status).toBe(201);
    const { jobId } = (await res.json()) as { jobId: string };
    const [row] = await rowsFor(`quote:${jobId}`);
    expect(await recipientsOf(`quote:${jobId}`)).toEqual([ids.owner]);
    expect(row).toMatchObject({ kind: "quote_requested", job_id: jobId });
    expect(row!.title).toContain("Aurelian 5T-48 notify");

    const list = await listOf(owner);
    const item = list.items.find((n) => n.href === `/bench/jobs/${jobId}`)!;
    expect(item).toMatchObject({ kind: "quote_requested", read: false });
    expect((await listOf(tech)).items.some((n) => n.href === `/bench/jobs/${jobId}`)).toBe(false);

    // The e-mail through the outbox, in the mail stand-in, leading to the job on the bench.
    const mail = await waitForMail(DEMO.owner.email, row!.title);
    expect(mail.html).toContain(`/bench/jobs/${jobId}`);
    expect(mail.text).toContain("Hums loudly");
  });
});

describe("an owner's message", () => {
  it("reaches the assigned technician only, carries the owner's words and never a workshop note", async () => {
    const customer = await newCustomer("notify-msg");
    const job = await createJob({ customerEmail: customer.email, state: "on_bench", technicianEmail: DEMO.tech.email });
    const note = `Workshop note ${randomUUID().slice(0, 6)}: owner sounded unsure about the cabinet crack.`;
    const noteRes = await tech.post(`/api/bench/jobs/${job.jobId}/notes`, { body: note, idempotencyKey: randomUUID() });
    expect(noteRes.status).toBeLessThan(300);
    // The technician's own message to the owner is not an event for staff: nobody is told.
    const own = await tech.post(`/api/bench/jobs/${job.jobId}/messages`, { body: "The chassis is out.", idempotencyKey: randomUUID() });
    expect(own.status).toBe(201);
    expect(await sql("select 1 from notification where job_id = $1", [job.jobId])).toHaveLength(0);

    const words = "Could you also look at the tuning drive? It slips near 1000 kHz.";
    const res = await ownerMessage(customer.client, job.jobId, words);
    expect(res.status).toBe(201);
    const { id } = (await res.json()) as { id: string };
    const rows = await rowsFor(`message:${id}`);
    expect(rows.map((r) => r.recipient_id)).toEqual([ids.tech]);
    expect(rows[0]!.body).toBe(words);
    expect(rows[0]!.body).not.toContain("Workshop note");
    expect(rows[0]!.title).not.toContain("Workshop note");
  });

  it("on a job nobody holds goes to the shop owner; a deactivated technician holding it gets nothing", async () => {
    const staffId = `notify-off-${randomUUID().slice(0, 8)}`;
    await sql(
      `insert into "user" (id, name, email, email_verified, role, banned) values ($1, 'Wendel Ash', $2, true, 'technician', true)`,
      [staffId, `${staffId}@kestrel-lane.example`],
    );
    const customer = await newCustomer("notify-banned");
    const job = await createJob({ customerEmail: customer.email, state: "on_bench" });
    await sql("update job set technician_id = $1 where id = $2", [staffId, job.jobId]);
    const res = await ownerMessage(customer.client, job.jobId, "Is there any news on the set?");
    const { id } = (await res.json()) as { id: string };
    expect(await recipientsOf(`message:${id}`)).toEqual([ids.owner]);
    expect(await sql("select 1 from notification where recipient_id = $1", [staffId])).toHaveLength(0);
    expect(await sql("select 1 from email_outbox where to_address = $1", [`${staffId}@kestrel-lane.example`])).toHaveLength(0);
  });

  it("follows each person's choices: in-app off leaves no row, e-mail on sends one", async () => {
    const prefs = (await (await tech.get("/api/staff/notification-preferences")).json()) as {
      preferences: Record<string, { inApp: boolean; email: boolean }>;
    };
    // The defaults: everything in the app; by e-mail only new requests and claims.
    expect(prefs.preferences.owner_message).toEqual({ inApp: true, email: false });
    expect(prefs.preferences.quote_requested).toEqual({ inApp: true, email: true });
    expect(prefs.preferences.claim_opened).toEqual({ inApp: true, email: true });

    const changed = { ...prefs.preferences, owner_message: { inApp: false, email: true } };
    const put = await tech.request("/api/staff/notification-preferences", { method: "PUT", json: { preferences: changed } });
    expect(put.status).toBe(200);
    // A missing channel is refused with the field named.
    const bad = await tech.request("/api/staff/notification-preferences", {
      method: "PUT",
      json: { preferences: { ...changed, claim_opened: { inApp: true } } },
    });
    expect(bad.status).toBe(400);
    expect(JSON.stringify(await bad.json())).toContain("preferences.claim_opened.email");

    const customer = await newCustomer("notify-prefs");
    const job = await createJob({ customerEmail: customer.email, state: "on_bench", technicianEmail: DEMO.tech.email });
    const words = `The pointer sticks at the left end (${randomUUID().slice(0, 6)}).`;
    const res = await ownerMessage(customer.client, job.jobId, words);
    const { id } = (await res.json()) as { id: string };
    expect(await rowsFor(`message:${id}`)).toHaveLength(0);
    const mail = await waitFor(
      async () => (await listMail(DEMO.tech.email)).find((m) => m.text.includes(words)),
      (m) => m !== undefined,
    );
    expect(mail).toBeDefined();
    expect(mail!.subject).toContain("Message from Test notify-prefs");

    // Back to the defaults.
    await tech.request("/api/staff/notification-preferences", {
      method: "PUT",
      json: { preferences: { ...changed, owner_message: { inApp: true, email: false } } },
    });
  });
});

describe("an estimate decision and its payment", () => {
  it("tells the shop of the approval once, and of the deposit once however often the processor delivers it", async () => {
    const customer = await newCustomer("notify-pay");
    const job = await seedJobWithEstimate({ email: customer.email });
    const approve = await customer.client.post(`/api/portal/jobs/${job.jobId}/estimate/approve`, { revisionId: job.revisionId });
    expect(approve.status).toBe(200);
    const decided = await rowsFor(`estimate:${job.revisionId}`);
    expect(decided.map((r) => r.recipient_id)).toEqual([ids.owner]);
    expect(decided[0]!.title).toContain("Estimate approved");

    const checkout = await customer.client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" });
    const sessionId = sessionIdFrom(((await checkout.json()) as { url: string }).url);
    await payOnStandin(sessionId, "succeed", { hold: true });
    const ev = await waitForEvent(sessionId, "checkout.session.completed");
    for (let i = 0; i < 3; i++) expect((await deliver(ev.payload)).status).toBe(200);
    const [payment] = await sql<{ id: string }>("select id from payment where job_id = $1 and status = 'paid'", [job.jobId]);
    const paid = await rowsFor(`payment:${payment!.id}`);
    expect(paid.map((r) => r.recipient_id)).toEqual([ids.owner]);
    expect(paid[0]!.title).toContain("$93.72");
    expect(await sql("select 1 from notification where job_id = $1 and kind = 'payment_received'", [job.jobId])).toHaveLength(1);
  });

  it("tells the technician holding the job of a decline, with the owner's reason", async () => {
    const customer = await newCustomer("notify-decline");
    const job = await seedJobWithEstimate({ email: customer.email });
    await sql("update job set technician_id = $1 where id = $2", [ids.tech2, job.jobId]);
    const res = await customer.client.post(`/api/portal/jobs/${job.jobId}/estimate/decline`, {
      revisionId: job.revisionId,
      reason: "More than the set is worth to me.",
    });
    expect(res.status).toBe(200);
    const rows = await rowsFor(`estimate:${job.revisionId}`);
    expect(rows.map((r) => r.recipient_id)).toEqual([ids.tech2]);
    expect(rows[0]!.body).toContain("More than the set is worth to me.");
  });
});

describe("refunds settling", () => {
  it("tells the shop owner of a refund the processor settled, but not the owner who asked for it on the spot", async () => {
    const customer = await newCustomer("notify-refund");
    const job = await seedJobWithEstimate({ email: customer.email });
    await customer.client.post(`/api/portal/jobs/${job.jobId}/estimate/approve`, { revisionId: job.revisionId });
    const checkout = await customer.client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" });
    await payOnStandin(sessionIdFrom(((await checkout.json()) as { url: string }).url), "succeed");
    const [payment] = await waitFor(
      () =>
        sql<{ id: string; payment_intent_id: string }>("select id, payment_intent_id from payment where job_id = $1 and status = 'paid'", [
          job.jobId,
        ]),
      (r) => r.length === 1,
    );

    // Asked by the shop owner in the office: the answer is on their screen; no notification to themselves.
    const asked = await owner.post(`/api/office/payments/${payment!.id}/refunds`, { amount: "10.00", reason: "Goodwill for the wait" });
    expect(asked.status).toBeLessThan(300);
    const { refundId } = (await asked.json()) as { refundId: string };
    await waitFor(
      async () => (await sql<{ status: string }>("select status from refund where id = $1", [refundId]))[0]!.status,
      (s) => s === "succeeded",
    );
    expect(await rowsFor(`refund:${refundId}`)).toHaveLength(0);

    // A refund nobody here asked for on the spot (written before the processor call), settled by the webhook.
    const [refund] = await sql<{ id: string }>(
      "insert into refund (payment_id, amount_minor, reason, idempotency_key) values ($1, 500, 'Dial glass arrived cracked', $2) returning id",
      [payment!.id, `notify-refund-${payment!.id}`],
    );
    await stripeClient().refunds.create(
      { payment_intent: payment!.payment_intent_id, amount: 500, metadata: { refundId: refund!.id } },
      { idempotencyKey: `refund-${refund!.id}` },
    );
    const rows = await waitFor(
      () => rowsFor(`refund:${refund!.id}`),
      (r) => r.length > 0,
    );
    expect(rows.map((r) => r.recipient_id)).toEqual([ids.owner]);
    expect(rows[0]!.title).toContain("settled");
  });
});

describe("a warranty claim", () => {
  it("goes to the technician who did the certified work, in the app and by e-mail, leading to the claim", async () => {
    const c = await createCertificate({ customerId: IDS.jonah, maker: "Corvane", model: `Claim ${randomUUID().slice(0, 4)}` });
    const claimant = await signedIn(DEMO.customer2);
    const res = await claimant.post("/api/claims", {
      symptomCategory: "hum",
      description: "A loud hum after ten minutes of play, getting worse.",
      statements: [],
      certificateId: c.certificateId,
    });
    expect(res.status).toBe(201);
    const { claim } = (await res.json()) as { claim: { id: string } };
    const rows = await rowsFor(`claim:${claim.id}`);
    expect(rows.map((r) => r.recipient_id)).toEqual([ids.tech]);
    expect(rows[0]).toMatchObject({ kind: "claim_opened", claim_id: claim.id });
    const item = (await listOf(tech)).items.find((n) => n.href === `/bench/claims/${claim.id}`);
    expect(item).toBeDefined();
    const mail = await waitForMail(DEMO.tech.email, rows[0]!.title);
    expect(mail.html).toContain(`/bench/claims/${claim.id}`);
  });
});

describe("one's own notifications", () => {
  it("are marked read and unread by their recipient only; anyone else gets 404 and sees none of them", async () => {
    const customer = await newCustomer("notify-own");
    const job = await createJob({ customerEmail: customer.email, state: "on_bench", technicianEmail: DEMO.tech.email });
    const { id: messageId } = (await (await ownerMessage(customer.client, job.jobId, "Thank you for the photos.")).json()) as {
      id: string;
    };
    const [row] = await sql<{ id: string }>("select id from notification where dedupe_key = $1", [`message:${messageId}`]);
    const id = row!.id;

    const before = await listOf(tech);
    expect(before.items.find((n) => n.id === id)?.read).toBe(false);
    expect((await (await tech.get("/api/staff/notifications/unread")).json()) as { unread: number }).toEqual({ unread: before.unread });

    // Another technician and the shop owner: not found, and it is not in their lists.
    for (const other of [tech2, owner]) {
      expect((await other.post(`/api/staff/notifications/${id}/read`, { read: true })).status).toBe(404);
      expect((await listOf(other)).items.some((n) => n.id === id)).toBe(false);
    }
    expect((await sql<{ read_at: Date | null }>("select read_at from notification where id = $1", [id]))[0]!.read_at).toBeNull();
    // A set owner has no notifications at all.
    expect((await customer.client.get("/api/staff/notifications")).status).toBe(404);

    const read = await tech.post(`/api/staff/notifications/${id}/read`, { read: true });
    expect(read.status).toBe(200);
    expect(await read.json()).toMatchObject({ id, read: true, unread: before.unread - 1 });
    const unread = await tech.post(`/api/staff/notifications/${id}/read`, { read: false });
    expect(await unread.json()).toMatchObject({ id, read: false, unread: before.unread });
    expect((await tech.post(`/api/staff/notifications/${id}/read`, { read: "yes" })).status).toBe(400);

    const all = await tech.post("/api/staff/notifications/read-all", {});
    expect(all.status).toBe(200);
    expect((await listOf(tech)).unread).toBe(0);
    // Marking all read touched only Tomas's rows.
    expect(
      await sql("select 1 from notification where recipient_id <> $1 and read_at is not null and dedupe_key = $2", [
        ids.tech,
        `message:${messageId}`,
      ]),
    ).toHaveLength(0);
  });
});
