import { randomUUID } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { newCustomer } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { waitForMail } from "../support/mail";
import { jpeg } from "../fixtures/images";
import { seedJobWithEstimate } from "../fixtures/jobs";
import { payOnStandin, sessionIdFrom } from "../fixtures/stripe";
import { quoteBody, ticketFor } from "../fixtures/uploads";

afterAll(async () => {
  await closeTestPool();
});

describe("quote request", () => {
  it("creates the set, the job, its photos, history, audit and the e-mail together; a resend is the same job", async () => {
    const { client, email } = await newCustomer("quote");
    const tickets = [
      await ticketFor(client, { name: "front.jpg", type: "image/jpeg", bytes: await jpeg() }),
      await ticketFor(client, { name: "back.jpg", type: "image/jpeg", bytes: await jpeg({ color: "#2f6b3a" }) }),
    ];
    const body = quoteBody(tickets, {
      maker: "Haldane",
      model: "Console <b>7</b>",
      bands: ["MW", "SW", "FM"],
      kind: "tube-transformer",
      status: "paid_in_full",
      customerId: "someone-else",
    });
    const res = await client.post("/api/portal/jobs", body);
    expect(res.status).toBe(201);
    const { jobId, number } = (await res.json()) as { jobId: string; number: string };
    expect(number).toMatch(/^KL-\d{4}$/);
    const [job] = await sql<{
      state: string;
      customer_email: string;
      cautions: Date | null;
      maker: string;
      model: string;
      profile: { bands: { kind: string }[] };
    }>(
      `select j.state, u.email as customer_email, j.cautions_acknowledged_at as cautions, s.maker, s.model, s.profile
       from job j join "user" u on u.id = j.customer_id join radio_set s on s.id = j.set_id where j.id = $1`,
      [jobId],
    );
    expect(job).toMatchObject({ state: "requested", customer_email: email, maker: "Haldane", model: "Console <b>7</b>" });
    expect(job!.cautions).not.toBeNull();
    expect(job!.profile.bands.map((b) => b.kind)).toEqual(["MW", "SW", "FM"]);
    expect(await sql("select 1 from photo where job_id = $1", [jobId])).toHaveLength(2);
    expect(await sql("select 1 from job_state_history where job_id = $1 and to_state = 'requested'", [jobId])).toHaveLength(1);
    expect(await sql("select 1 from audit_event where entity_id = $1 and action = 'job.create'", [jobId])).toHaveLength(1);
    const mail = await waitForMail(email, "We received your quote request");
    expect(mail.text).toContain(number);

    const again = await client.post("/api/portal/jobs", body);
    expect(again.status).toBe(200);
    expect(((await again.json()) as { jobId: string }).jobId).toBe(jobId);
    expect(await sql(`select 1 from job j join "user" u on u.id = j.customer_id where u.email = $1`, [email])).toHaveLength(1);

    const page = await client.get(`/portal/jobs/${jobId}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).not.toContain("<b>7</b>");
  });

  it("answers field by field and keeps nothing when the request is incomplete", async () => {
    const { client, email } = await newCustomer("incomplete");
    const res = await client.post("/api/portal/jobs", quoteBody([], { cautionsAcknowledged: false, maker: "", bands: [] }));
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(Object.keys(error.fields).sort()).toEqual(["bands", "cautionsAcknowledged", "maker", "photos"]);
    expect(error.fields.photos).toMatch(/at least one photo/);
    expect(await sql(`select 1 from job j join "user" u on u.id = j.customer_id where u.email = $1`, [email])).toHaveLength(0);
  });
});

describe("the owner's job page data", () => {
  it("shows the estimate by category with reasons and totals, but never cost prices, markups or internal notes", async () => {
    const { client, email } = await newCustomer("reader");
    const job = await seedJobWithEstimate({ email });
    const [tech] = await sql<{ id: string }>(`select id from "user" where email = 'tomas@kestrel-lane.example'`);
    await sql(
      "insert into message (job_id, author_id, body, internal) values ($1, $2, 'Owner seems unsure about the cabinet; quote high.', true), ($1, $2, 'We will start with a safety check.', false)",
      [job.jobId, tech!.id],
    );
    const res = await client.get(`/api/portal/jobs/${job.jobId}`);
    expect(res.status).toBe(200);
    expect(res.headers.get("cache-control")).toContain("no-store");
    const text = await res.text();
    for (const hidden of ["partCost", "part_cost", "markup", "Bp", "quote high", "technicianId", "customerId"])
      expect(text).not.toContain(hidden);
    const view = JSON.parse(text) as {
      estimate: {
        groups: { label: string; lines: { reason: string }[] }[];
        total: { text: string };
        deposit: { text: string };
        warranty: { termDays: number; covers: string[] };
        billing: { note: string; rounding: { minor: number } };
      };
    };
    expect(view.estimate.groups.map((g) => g.label)).toEqual(["Inspection", "Safety", "Recap", "Parts"]);
    // The rounding is explained once: 30 + 20 + 40 minutes listed (worked by hand).
    expect(view.estimate.billing.note).toMatch(/^Labour is billed as 90 minutes/);
    expect(view.estimate.billing.rounding.minor).toBe(0);
    expect(view.estimate.groups[1]!.lines[0]!.reason).toMatch(/^AC\/DC set/);
    expect(view.estimate.total.text).toBe("$312.40");
    expect(view.estimate.deposit.text).toBe("$93.72");
    expect(view.estimate.warranty.termDays).toBe(90);
    const thread = await (await client.get(`/api/portal/jobs/${job.jobId}/messages`)).text();
    expect(thread).toContain("We will start with a safety check.");
    expect(thread).not.toContain("quote high");
  });

  it("asks for a reason to decline, and refuses a decision on a revision that was replaced", async () => {
    const { client, email } = await newCustomer("decider");
    const job = await seedJobWithEstimate({ email });
    const noReason = await client.post(`/api/portal/jobs/${job.jobId}/estimate/decline`, { revisionId: job.revisionId, reason: "" });
    expect(noReason.status).toBe(400);
    expect(((await noReason.json()) as { error: { fields: Record<string, string> } }).error.fields.reason).toBeTruthy();
    // The shop sends revision 2 before the owner decides on revision 1.
    await sql("update estimate_revision set status = 'superseded' where id = $1", [job.revisionId]);
    const [rev2] = await sql<{ id: string }>(
      `insert into estimate_revision (estimate_id, job_id, revision, status, currency, labour_minor, parts_minor, tax_minor, total_minor, deposit_minor, pricing, change_summary)
       select estimate_id, job_id, 2, 'sent', currency, labour_minor, parts_minor + 2000, tax_minor, total_minor + 2000, deposit_minor, pricing, 'The dial cord is broken and must be restrung.' from estimate_revision where id = $1 returning id`,
      [job.revisionId],
    );
    const stale = await client.post(`/api/portal/jobs/${job.jobId}/estimate/approve`, { revisionId: job.revisionId });
    expect(stale.status).toBe(409);
    const view = (await (await client.get(`/api/portal/jobs/${job.jobId}`)).json()) as {
      estimate: { revision: number; changeSummary: string; decidable: boolean };
    };
    expect(view.estimate).toMatchObject({ revision: 2, changeSummary: "The dial cord is broken and must be restrung.", decidable: true });
    const declined = await client.post(`/api/portal/jobs/${job.jobId}/estimate/decline`, {
      revisionId: rev2!.id,
      reason: "Too much for a set I may sell.",
    });
    expect(declined.status).toBe(200);
    const [row] = await sql<{ state: string; reason: string }>(
      "select j.state, r.decline_reason as reason from job j join estimate_revision r on r.job_id = j.id and r.revision = 2 where j.id = $1",
      [job.jobId],
    );
    expect(row).toEqual({ state: "declined_by_owner", reason: "Too much for a set I may sell." });
  });

  it("sends a customer's answer back to triage when the shop was waiting on it", async () => {
    const { client, email } = await newCustomer("answer");
    const job = await seedJobWithEstimate({ email, state: "awaiting_owner" });
    const res = await client.post(`/api/portal/jobs/${job.jobId}/messages`, {
      body: "Yes, the label says 5T-48 and chassis 4471.",
      idempotencyKey: randomUUID(),
    });
    expect(res.status).toBe(201);
    expect((await sql<{ state: string }>("select state from job where id = $1", [job.jobId]))[0]!.state).toBe("in_triage");
  });
});

describe("another owner's things are not found", () => {
  it("answers 404 to customer B for customer A's job, photo, estimate and payment", async () => {
    const a = await newCustomer("owner-a");
    const b = await newCustomer("owner-b");
    const ticket = await ticketFor(a.client, { name: "front.jpg", type: "image/jpeg", bytes: await jpeg() });
    const created = (await (await a.client.post("/api/portal/jobs", quoteBody([ticket]))).json()) as { jobId: string };
    const [photo] = await sql<{ id: string }>("select id from photo where job_id = $1", [created.jobId]);
    const job = await seedJobWithEstimate({ email: a.email });
    await a.client.post(`/api/portal/jobs/${job.jobId}/estimate/approve`, { revisionId: job.revisionId });
    const checkout = (await (await a.client.post("/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" })).json()) as {
      url: string;
      paymentId: string;
    };
    const sessionId = sessionIdFrom(checkout.url);
    await payOnStandin(sessionId, "succeed");

    const gets = [
      `/portal/jobs/${created.jobId}`,
      `/portal/jobs/${job.jobId}/payment?session_id=${sessionId}`,
      `/api/portal/jobs/${created.jobId}`,
      `/api/portal/jobs/${job.jobId}`,
      `/api/portal/jobs/${job.jobId}/messages`,
      `/api/photos/${photo!.id}`,
      `/api/photos/${photo!.id}?size=thumb`,
      `/api/payments/${checkout.paymentId}`,
      `/api/payments/session/${sessionId}`,
    ];
    for (const path of gets) {
      expect((await a.client.get(path)).status, `A ${path}`).toBe(200);
      expect((await b.client.get(path)).status, `B ${path}`).toBe(404);
    }
    const posts: [string, unknown][] = [
      [`/api/portal/jobs/${job.jobId}/estimate/approve`, { revisionId: job.revisionId }],
      [`/api/portal/jobs/${job.jobId}/estimate/decline`, { revisionId: job.revisionId, reason: "Not mine to decide" }],
      [`/api/portal/jobs/${job.jobId}/messages`, { body: "Hello from B", idempotencyKey: randomUUID() }],
      ["/api/payments/checkout", { jobId: job.jobId, purpose: "deposit" }],
    ];
    for (const [path, body] of posts) expect((await b.client.post(path, body)).status, `B POST ${path}`).toBe(404);
    expect(await sql("select 1 from message where job_id = $1", [job.jobId])).toHaveLength(0);
  });
});
