import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { firstLink, listMail, waitForMail } from "../support/mail";
import { AURELIAN_PROFILE, userId } from "./bench-fixtures";
import { stopQueue } from "./certificates-fixtures";

// Counter and phone intake. Outside references: one account per e-mail address (common practice for
// sign-in systems: the address is the account's key), single-use invitation tokens (OWASP Forgot Password
// cheat sheet, "single use"), and the `.invalid` top-level domain that can never resolve (RFC 2606 §2).

let tech: TestClient;
let owner: TestClient;

beforeAll(async () => {
  tech = await signedIn(DEMO.tech);
  owner = await signedIn(DEMO.owner);
});

afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

const SET = {
  maker: "Corvane",
  model: "Tern 4",
  year: "1957",
  kind: "tube-acdc",
  bands: ["MW"],
  dialEnds: { MW: { low: "55", high: "160" } },
  symptoms: "Hums loudly and no stations come through.",
  poweredRecently: "briefly",
  cautionsGiven: true,
  photos: [],
};

function newCustomerIntake(overrides: Record<string, unknown> = {}) {
  return {
    customerMode: "new",
    customerName: "Rowan Teague",
    customerEmail: `rowan-${randomUUID().slice(0, 8)}@example.org`,
    customerPhone: "",
    access: "invite",
    channel: "counter",
    setAtShop: true,
    contactPreference: "email",
    ...SET,
    idempotencyKey: randomUUID(),
    ...overrides,
  };
}

type Taken = { jobId: string; number: string; customerId: string; invited: boolean; duplicate: boolean };

async function takeIn(client: TestClient, body: unknown): Promise<Taken> {
  const res = await client.post("/api/bench/intake", body);
  if (res.status !== 201) throw new Error(`intake failed: ${res.status} ${await res.text()}`);
  return (await res.json()) as Taken;
}

describe("who may take a set in", () => {
  it("lets a technician and the shop owner in; a set owner gets 404 and a visitor 401", async () => {
    const byTech = await takeIn(tech, newCustomerIntake({ access: "contact" }));
    const byOwner = await takeIn(owner, newCustomerIntake({ access: "contact", channel: "phone", setAtShop: false }));
    expect(byTech.jobId).not.toBe(byOwner.jobId);
    const customer = await signedIn(DEMO.customer);
    expect((await customer.post("/api/bench/intake", newCustomerIntake())).status).toBe(404);
    expect((await customer.get("/api/bench/customers?q=holloway")).status).toBe(404);
    expect((await customer.get("/bench/intake")).status).toBe(404);
    expect((await new TestClient().post("/api/bench/intake", newCustomerIntake())).status).toBe(401);
  });
});

describe("finding or adding the customer", () => {
  it("never makes a second account for an e-mail address, in any letter case", async () => {
    const email = `hazel-${randomUUID().slice(0, 8)}@example.org`;
    const first = await takeIn(tech, newCustomerIntake({ customerEmail: email, access: "contact" }));
    const second = await takeIn(
      owner,
      newCustomerIntake({ customerEmail: email.toUpperCase(), customerName: "H. Dunmore", access: "contact" }),
    );
    expect(second.customerId).toBe(first.customerId);
    const [row] = await sql<{ n: number }>(`select count(*)::int as n from "user" where lower(email) = $1`, [email]);
    expect(row!.n).toBe(1);
    // The same form sent twice (a lost answer) is the same job.
    const body = newCustomerIntake({ access: "contact", customerEmail: "", customerPhone: "+1 555 0190", contactPreference: "phone" });
    const a = await takeIn(tech, body);
    const again = await tech.post("/api/bench/intake", body);
    expect(again.status).toBe(200);
    expect(((await again.json()) as Taken).jobId).toBe(a.jobId);
  });

  it("finds customers by name, e-mail or the digits of a phone number, never showing a placeholder address", async () => {
    const digits = String(Math.floor(1_000_000 + Math.random() * 8_999_999));
    const phone = `+1 (555) ${digits.slice(0, 3)}-${digits.slice(3)}`;
    const taken = await takeIn(
      tech,
      newCustomerIntake({
        customerName: "Ottoline Brask",
        customerEmail: "",
        customerPhone: phone,
        access: "contact",
        contactPreference: "phone",
      }),
    );
    const byDigits = await tech.get(`/api/bench/customers?q=${digits}`);
    expect(byDigits.status).toBe(200);
    const found = ((await byDigits.json()) as { customers: { id: string; email: string | null; access: string }[] }).customers;
    const me = found.find((c) => c.id === taken.customerId);
    expect(me).toMatchObject({ email: null, access: "contact" });
    const [stored] = await sql<{ email: string }>(`select email from "user" where id = $1`, [taken.customerId]);
    expect(stored!.email.endsWith(".invalid")).toBe(true);
    // Nothing is queued to a phone-only contact's placeholder.
    const [outbox] = await sql<{ n: number }>(`select count(*)::int as n from email_outbox where to_address = $1`, [stored!.email]);
    expect(outbox!.n).toBe(0);
    const tooShort = await tech.get("/api/bench/customers?q=a");
    expect(tooShort.status).toBe(400);
    expect(((await tooShort.json()) as { error: { fields: Record<string, string> } }).error.fields.q).toMatch(/^Search:/);
  });

  it("an invited customer redeems the single-use link once and then sees the job in the portal", async () => {
    const email = `quill-${randomUUID().slice(0, 8)}@example.org`;
    const started = Date.now();
    const taken = await takeIn(tech, newCustomerIntake({ customerEmail: email, access: "invite" }));
    expect(taken.invited).toBe(true);
    const mail = await waitForMail(email, "Follow your Corvane Tern 4 online", { after: started });
    const link = new URL(firstLink(mail, "/welcome?token="));
    const token = link.searchParams.get("token")!;
    const accepted = await new TestClient().post("/api/staff-invitations/accept", { token, password: "padder-trimmer-58" });
    expect(accepted.status).toBe(200);
    expect(((await accepted.json()) as { role: string }).role).toBe("customer");
    expect((await new TestClient().post("/api/staff-invitations/accept", { token, password: "padder-trimmer-59" })).status).toBe(404);
    const client = new TestClient();
    await client.signIn(email, "padder-trimmer-58");
    const jobs = ((await (await client.get("/api/portal/jobs")).json()) as { jobs: { id: string }[] }).jobs;
    expect(jobs.map((j) => j.id)).toContain(taken.jobId);
    expect((await client.get(`/portal/jobs/${taken.jobId}`)).status).toBe(200);
    expect((await client.get("/api/bench/customers?q=quill")).status).toBe(404);
  });

  it("a contact kept without sign-in cannot sign in, and a password-reset request sends nothing", async () => {
    const email = `wren-${randomUUID().slice(0, 8)}@example.org`;
    const taken = await takeIn(tech, newCustomerIntake({ customerEmail: email, access: "contact" }));
    // The job's own e-mail still reaches a contact who gave an address.
    await waitForMail(email, "We received your quote request");
    const [cred] = await sql<{ n: number }>(`select count(*)::int as n from account where user_id = $1`, [taken.customerId]);
    expect(cred!.n).toBe(0);
    for (const password of ["padder-trimmer-58", ""]) {
      const res = await new TestClient().post("/api/auth/sign-in/email", { email, password });
      expect(res.status).not.toBe(200);
    }
    const started = Date.now();
    expect((await new TestClient().post("/api/auth/request-password-reset", { email, redirectTo: "/reset-password" })).status).toBe(200);
    await new Promise((r) => setTimeout(r, 2000));
    const resets = (await listMail(email)).filter((m) => m.subject.includes("Choose a new password") && Date.parse(m.createdAt) >= started);
    expect(resets).toEqual([]);
  });
});

describe("the job after intake", () => {
  it("starts in triage; a set handed over at the counter is received, one taken in by phone is not", async () => {
    const counter = await takeIn(tech, newCustomerIntake({ access: "contact" }));
    const phone = await takeIn(tech, newCustomerIntake({ access: "contact", channel: "phone", setAtShop: false }));
    const rows = await sql<{ id: string; state: string; channel: string; received: boolean; delivery: string }>(
      `select id, state, channel, received_at is not null as received, delivery from job where id = any($1)`,
      [[counter.jobId, phone.jobId]],
    );
    const byId = new Map(rows.map((r) => [r.id, r]));
    expect(byId.get(counter.jobId)).toMatchObject({ state: "in_triage", channel: "counter", received: true, delivery: "drop-off" });
    expect(byId.get(phone.jobId)).toMatchObject({ state: "in_triage", channel: "phone", received: false });
    const [audited] = await sql<{ n: number }>(
      `select count(*)::int as n from audit_event where action = 'job.intake' and entity_id = $1`,
      [counter.jobId],
    );
    expect(audited!.n).toBe(1);
  });

  it("records the owner's approval given by phone: who recorded it, when and how, audited and shown on the job", async () => {
    const taken = await takeIn(tech, newCustomerIntake({ access: "contact" }));
    await sql(`update radio_set set profile = $2 where id = (select set_id from job where id = $1)`, [
      taken.jobId,
      JSON.stringify(AURELIAN_PROFILE),
    ]);
    const view = (await (await tech.get(`/api/bench/jobs/${taken.jobId}/estimate`)).json()) as { lines: unknown[] };
    expect(
      (await tech.request(`/api/bench/jobs/${taken.jobId}/estimate`, { method: "PUT", json: { version: 0, lines: view.lines } })).status,
    ).toBe(200);
    expect((await tech.post(`/api/bench/jobs/${taken.jobId}/estimate/send`, { version: 1 })).status).toBe(200);
    const [rev] = await sql<{ id: string }>(`select id from estimate_revision where job_id = $1`, [taken.jobId]);

    const noNote = await tech.post(`/api/bench/jobs/${taken.jobId}/decision`, {
      revisionId: rev!.id,
      decision: "approve",
      medium: "phone",
      note: "",
    });
    expect(noNote.status).toBe(400);
    expect(((await noNote.json()) as { error: { fields: Record<string, string> } }).error.fields.note).toMatch(/^What the owner said:/);
    const customer = await signedIn(DEMO.customer);
    expect(
      (
        await customer.post(`/api/bench/jobs/${taken.jobId}/decision`, {
          revisionId: rev!.id,
          decision: "approve",
          medium: "phone",
          note: "yes",
        })
      ).status,
    ).toBe(404);

    const ok = await tech.post(`/api/bench/jobs/${taken.jobId}/decision`, {
      revisionId: rev!.id,
      decision: "approve",
      medium: "phone",
      note: "Rowan rang at ten and agreed to the full estimate.",
    });
    expect(ok.status).toBe(200);
    const techId = await userId(DEMO.tech.email);
    const [stored] = await sql<{ status: string; decided_by: string; decision_recorded_by: string; decision_medium: string }>(
      `select status, decided_by, decision_recorded_by, decision_medium from estimate_revision where id = $1`,
      [rev!.id],
    );
    expect(stored).toMatchObject({
      status: "approved",
      decided_by: taken.customerId,
      decision_recorded_by: techId,
      decision_medium: "phone",
    });
    const [audit] = await sql<{ actor_id: string; after: { medium: string; recordedFor: string; note: string } }>(
      `select actor_id, after from audit_event where action = 'estimate.approve_recorded' and entity_id = $1`,
      [rev!.id],
    );
    expect(audit).toMatchObject({ actor_id: techId, after: { medium: "phone", recordedFor: taken.customerId } });
    const [job] = await sql<{ state: string }>(`select state from job where id = $1`, [taken.jobId]);
    expect(["approved", "deposit_paid"]).toContain(job!.state);
    const detail = (await (await tech.get(`/api/bench/jobs/${taken.jobId}`)).json()) as {
      decisions: { recordedByName: string | null; decisionMedium: string | null; decisionNote: string | null }[];
    };
    expect(detail.decisions[0]).toMatchObject({ recordedByName: "Tomas Reyne", decisionMedium: "phone" });
    // Recorded once: the same answer again is refused, not recorded twice.
    const twice = await tech.post(`/api/bench/jobs/${taken.jobId}/decision`, {
      revisionId: rev!.id,
      decision: "approve",
      medium: "phone",
      note: "again",
    });
    expect(twice.status).toBe(409);
  });
});

describe("hostile input", () => {
  it("names the field and what is allowed, and stores nothing", async () => {
    const before = await sql<{ n: number }>(`select count(*)::int as n from job`);
    const res = await tech.post(
      "/api/bench/intake",
      newCustomerIntake({
        customerEmail: "not-an-address",
        customerPhone: "call me maybe",
        year: "19x7",
        kind: "crystal-set",
        channel: "carrier-pigeon",
        symptoms: "short",
        idempotencyKey: "not-a-uuid",
      }),
    );
    expect(res.status).toBe(400);
    const fields = ((await res.json()) as { error: { fields: Record<string, string> } }).error.fields;
    expect(fields.year).toMatch(/^Year:/);
    expect(fields.kind).toMatch(/^Kind of set:/);
    expect(fields.channel).toMatch(/^Came in:/);
    expect(fields.symptoms).toMatch(/^What it does:/);
    const existing = await tech.post("/api/bench/intake", newCustomerIntake({ customerMode: "existing", customerId: "no-such-customer" }));
    expect(existing.status).toBe(400);
    expect(((await existing.json()) as { error: { fields: Record<string, string> } }).error.fields.customerId).toMatch(/^Customer:/);
    const badContact = await tech.post("/api/bench/intake", newCustomerIntake({ customerEmail: "not-an-address" }));
    expect(((await badContact.json()) as { error: { fields: Record<string, string> } }).error.fields.customerEmail).toMatch(
      /^Customer's e-mail:/,
    );
    const staffEmail = await tech.post("/api/bench/intake", newCustomerIntake({ customerEmail: DEMO.tech.email }));
    expect(((await staffEmail.json()) as { error: { fields: Record<string, string> } }).error.fields.customerEmail).toMatch(
      /staff account/,
    );
    const nul = await tech.post("/api/bench/intake", newCustomerIntake({ symptoms: "Hums loudly\u0000 and smells hot" }));
    expect(nul.status).toBe(400);
    expect(Object.keys(((await nul.json()) as { error: { fields: Record<string, string> } }).error.fields)).toContain("symptoms");
    const after = await sql<{ n: number }>(`select count(*)::int as n from job`);
    expect(after[0]!.n).toBe(before[0]!.n);
  });
});
