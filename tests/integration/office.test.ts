import { randomUUID } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { sql } from "../support/db";
import { TestClient } from "../support/http";
import {
  failNextProcessorCalls,
  insertHistory,
  insertJob,
  insertPayment,
  insertRefund,
  paidPaymentWithCharge,
  processorRefunds,
  waitFor,
} from "./office-fixtures";

type Snapshot = {
  version: number;
  values: Record<string, unknown> & {
    version: number;
    labourRate: string;
    identity: { phone: string };
    deposit: { processorMinimum: string; percent: string; atLeastParts: boolean };
    warranty: { designation: string; fullAcknowledged: boolean };
    tolerances: Record<string, unknown>;
    billingRounding: string;
  };
};

const PAGES = ["/office/settings", "/office/payments", `/office/payments/${randomUUID()}`, "/office/audit", "/office/reports"];

async function settingsOf(owner: TestClient): Promise<Snapshot> {
  const res = await owner.get("/api/office/settings");
  expect(res.status).toBe(200);
  return (await res.json()) as Snapshot;
}

async function put(client: TestClient, values: unknown) {
  return client.request("/api/office/settings", { method: "PUT", json: values });
}

// Saves made from a given version: each save writes one audit row whose "before" names the version it replaced.
async function savesFromVersion(version: number): Promise<number> {
  const [row] = await sql<{ n: number }>(
    `select count(*)::int as n from audit_event where action = 'settings.update' and (before->>'version')::int = $1`,
    [version],
  );
  return row!.n;
}

// Puts the shop back as it was, so other tests keep pricing from the seeded figures.
const restore: (() => Promise<void>)[] = [];
afterAll(async () => {
  for (const fn of restore.reverse()) await fn();
});
async function rememberSettings(owner: TestClient) {
  const original = await settingsOf(owner);
  restore.push(async () => {
    const now = await settingsOf(owner);
    const res = await put(owner, { ...original.values, version: now.version });
    expect(res.status).toBe(200);
  });
}

describe("the office is the shop owner's alone", () => {
  it("answers 404 to technicians and set owners on every office page and route, and changes nothing for them", async () => {
    const owner = await signedIn(DEMO.owner);
    const before = await settingsOf(owner);
    const { paymentId } = await paidPaymentWithCharge(4000);
    for (const who of [DEMO.tech, DEMO.customer]) {
      const client = await signedIn(who);
      for (const path of PAGES) expect((await client.get(path)).status, `${who.email} ${path}`).toBe(404);
      for (const path of [
        "/api/office/settings",
        "/api/office/payments",
        `/api/office/payments/${paymentId}`,
        "/api/office/audit",
        "/api/office/reports",
      ]) {
        expect((await client.get(path)).status, `${who.email} GET ${path}`).toBe(404);
      }
      const changed = { ...before.values, labourRate: "1.00" };
      expect((await put(client, changed)).status, `${who.email} PUT settings`).toBe(404);
      expect(
        (await client.post(`/api/office/payments/${paymentId}/refunds`, { amount: "10.00", reason: "Not allowed" })).status,
        `${who.email} refund`,
      ).toBe(404);
    }
    const after = await settingsOf(owner);
    expect(after.version).toBe(before.version);
    expect(after.values.labourRate).toBe(before.values.labourRate);
    const [refunds] = await sql<{ n: number }>(`select count(*)::int as n from refund where payment_id = $1`, [paymentId]);
    expect(refunds!.n).toBe(0);
  });

  it("sends anonymous visitors to sign-in and answers 401 on the routes", async () => {
    const anon = new TestClient();
    for (const path of PAGES) {
      const res = await anon.get(path);
      expect(res.status, path).toBeGreaterThanOrEqual(300);
      expect(res.status, path).toBeLessThan(400);
      expect(res.headers.get("location"), path).toContain("/sign-in");
    }
    expect((await anon.get("/api/office/settings")).status).toBe(401);
    expect((await anon.get("/api/office/audit")).status).toBe(401);
  });

  it("lets the owner open every office page", async () => {
    const owner = await signedIn(DEMO.owner);
    for (const path of ["/office", "/office/settings", "/office/payments", "/office/audit", "/office/reports"])
      expect((await owner.get(path)).status, path).toBe(200);
    expect((await owner.get(`/office/payments/${randomUUID()}`)).status).toBe(404);
    expect((await owner.get("/office/payments/not-a-uuid")).status).toBe(404);
  });
});

describe("settings", () => {
  it("stores money typed in major units as minor units and writes exactly one audit row with before and after", async () => {
    const owner = await signedIn(DEMO.owner);
    await rememberSettings(owner);
    const s = await settingsOf(owner);
    const [stored] = await sql<{ min: number; phone: string }>(
      `select (policy->'deposit'->>'processorMinimumMinor')::int as min, phone from shop_settings where id = 'shop'`,
    );
    expect(await savesFromVersion(s.version)).toBe(0);

    // A number other than the stored one, so the phone is always among what changed.
    const phone = ["+1 555 0117", "+1 555 0123"].find((p) => p !== stored!.phone)!;
    const res = await put(owner, {
      ...s.values,
      identity: { ...s.values.identity, phone },
      deposit: { ...s.values.deposit, processorMinimum: "0.65" },
    });
    expect(res.status).toBe(200);
    const saved = (await res.json()) as Snapshot;
    expect(saved.version).toBe(s.version + 1);
    expect(saved.values.deposit.processorMinimum).toBe("0.65");

    const [row] = await sql<{ min: number; phone: string; version: number; updated_by: string }>(
      `select (policy->'deposit'->>'processorMinimumMinor')::int as min, phone, version, updated_by from shop_settings where id = 'shop'`,
    );
    expect(row).toMatchObject({ min: 65, phone, version: s.version + 1, updated_by: "demo-owner-odile" });
    expect(await savesFromVersion(s.version)).toBe(1);
    const [a] = await sql<{ actor_id: string; entity: string; before: Record<string, unknown>; after: Record<string, unknown> }>(
      `select actor_id, entity, before, after from audit_event where action = 'settings.update' order by id desc limit 1`,
    );
    expect(a!.actor_id).toBe("demo-owner-odile");
    expect(a!.entity).toBe("shop_settings");
    expect(a!.before).toMatchObject({ version: s.version, phone: stored!.phone, "policy.deposit.processorMinimumMinor": stored!.min });
    expect(a!.after).toMatchObject({ version: s.version + 1, phone, "policy.deposit.processorMinimumMinor": 65 });
    // Only what changed is listed.
    expect(Object.keys(a!.after).sort()).toEqual(["phone", "policy.deposit.processorMinimumMinor", "version"].sort());
  });

  it("refuses bad input field by field and saves nothing", async () => {
    const owner = await signedIn(DEMO.owner);
    const s = await settingsOf(owner);
    const bad = await put(owner, { ...s.values, labourRate: "90.125", deposit: { ...s.values.deposit, percent: "130" } });
    expect(bad.status).toBe(400);
    const body = (await bad.json()) as { error: { fields: Record<string, string> } };
    expect(body.error.fields.labourRate).toMatch(/2 decimal places/);
    expect(body.error.fields["deposit.percent"]).toMatch(/at most 100/);

    // Calling it a full warranty is a deliberate choice: without the confirmation it is refused.
    const full = await put(owner, { ...s.values, warranty: { ...s.values.warranty, designation: "full", fullAcknowledged: false } });
    expect(full.status).toBe(400);
    expect(((await full.json()) as { error: { fields: Record<string, string> } }).error.fields["warranty.fullAcknowledged"]).toMatch(
      /minimum standards/,
    );

    expect((await settingsOf(owner)).version).toBe(s.version);
    expect(await savesFromVersion(s.version)).toBe(0);
  });

  it("refuses a leakage limit above the published ceiling, naming the field (published: UL 101 two-wire 0.5 mA; IEC 60065 Annex D)", async () => {
    const owner = await signedIn(DEMO.owner);
    const s = await settingsOf(owner);
    const res = await put(owner, { ...s.values, tolerances: { ...s.values.tolerances, leakageLimitMA: { v120: 10, v230: 0.49 } } });
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(body.error.fields["tolerances.leakageLimitMA.v120"]).toMatch(/at most 0\.5 mA, the published limit/);
    expect((await settingsOf(owner)).version).toBe(s.version);
  });

  it("refuses a currency change while the catalogue and open estimates are priced in the old currency, and saves nothing", async () => {
    const owner = await signedIn(DEMO.owner);
    const s = await settingsOf(owner);
    const res = await put(owner, { ...s.values, currency: { code: "EUR", exponent: 2 } });
    expect(res.status).toBe(409);
    const body = (await res.json()) as { error: { message: string; fields?: Record<string, string> } };
    expect(body.error.message).toMatch(/The currency stays USD: the parts catalogue \(\d+ parts\)/);
    expect(body.error.message).toMatch(/without converting\. Nothing was saved\./);
    expect((await settingsOf(owner)).version).toBe(s.version);
  });

  it("stores the shop's choice of per-line rounding", async () => {
    const owner = await signedIn(DEMO.owner);
    await rememberSettings(owner);
    const s = await settingsOf(owner);
    expect(s.values.billingRounding).toBe("job");
    const res = await put(owner, { ...s.values, billingRounding: "line" });
    expect(res.status).toBe(200);
    const [row] = await sql<{ rounding: string }>(`select policy->>'billingRounding' as rounding from shop_settings where id = 'shop'`);
    expect(row!.rounding).toBe("line");
    const now = await settingsOf(owner);
    expect((await put(owner, { ...now.values, billingRounding: "job" })).status).toBe(200);
    const bad = await put(owner, { ...(await settingsOf(owner)).values, billingRounding: "never" });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { fields: Record<string, string> } }).error.fields.billingRounding).toMatch(
      /once per job or on each line/,
    );
  });

  it("answers 409 to a stale save, keeps the first save, and writes no audit row for the refused one", async () => {
    const owner = await signedIn(DEMO.owner);
    await rememberSettings(owner);
    const s = await settingsOf(owner);
    const first = await put(owner, { ...s.values, identity: { ...s.values.identity, phone: "+1 555 0101" } });
    expect(first.status).toBe(200);
    const stale = await put(owner, { ...s.values, identity: { ...s.values.identity, phone: "+1 555 0202" } });
    expect(stale.status).toBe(409);
    const body = (await stale.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe("stale");
    expect(body.error.message).toMatch(/Nothing was saved; your changes are still in the form/);
    // One save from this version, and it is the first one.
    const fromThisVersion = await sql<{ after: { phone?: string; version: number } }>(
      `select after from audit_event where action = 'settings.update' and (before->>'version')::int = $1`,
      [s.version],
    );
    expect(fromThisVersion).toEqual([{ after: expect.objectContaining({ phone: "+1 555 0101", version: s.version + 1 }) }]);
    const [row] = await sql<{ phone: string; version: number }>(`select phone, version from shop_settings where id = 'shop'`);
    if (row!.version === s.version + 1) expect(row!.phone).toBe("+1 555 0101");
    expect(row!.phone).not.toBe("+1 555 0202");
  });

  it("lets exactly one of two simultaneous saves of the same version through", async () => {
    const owner = await signedIn(DEMO.owner);
    const other = await signedIn(DEMO.owner);
    await rememberSettings(owner);
    const s = await settingsOf(owner);
    const results = await Promise.all([
      put(owner, { ...s.values, identity: { ...s.values.identity, phone: "+1 555 0303" } }),
      put(other, { ...s.values, identity: { ...s.values.identity, phone: "+1 555 0404" } }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
    expect(await savesFromVersion(s.version)).toBe(1);
  });
});

describe("refunds", () => {
  it("refunds part of a payment and shows it as refunded once the processor's webhook confirms it", async () => {
    const owner = await signedIn(DEMO.owner);
    const { paymentId } = await paidPaymentWithCharge(12_000);
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, {
      amount: "45.50",
      reason: "Dial glass was not replaced as quoted",
    });
    expect(res.status).toBe(202);
    const { refundId } = (await res.json()) as { refundId: string };
    const [requested] = await sql<{ status: string; amount_minor: number; idempotency_key: string }>(
      `select status, amount_minor, idempotency_key from refund where id = $1`,
      [refundId],
    );
    expect(requested!.amount_minor).toBe(4550);
    expect(requested!.idempotency_key).toBe(`refund-${refundId}`);

    const settled = await waitFor(
      async () => {
        const [r] = await sql<{ status: string; refunded: number; processor_refund_id: string | null }>(
          `select r.status, p.refunded_minor as refunded, r.processor_refund_id from refund r join payment p on p.id = r.payment_id where r.id = $1`,
          [refundId],
        );
        return r && r.status === "succeeded" && r.refunded === 4550 ? r : null;
      },
      { what: "the charge.refunded webhook" },
    );
    expect(settled.processor_refund_id).toMatch(/^re_/);
    const [payment] = await sql<{ status: string; amount_minor: number }>(`select status, amount_minor from payment where id = $1`, [
      paymentId,
    ]);
    expect(payment).toEqual({ status: "paid", amount_minor: 12_000 });
    const audits = await sql<{ action: string; actor_id: string | null }>(
      `select action, actor_id from audit_event where entity_id in ($1, $2) order by id`,
      [paymentId, refundId],
    );
    expect(audits.filter((a) => a.action === "refund.request")).toEqual([{ action: "refund.request", actor_id: "demo-owner-odile" }]);

    const detail = (await (await owner.get(`/api/office/payments/${paymentId}`)).json()) as {
      refundedMinor: number;
      inFlightMinor: number;
      refunds: { status: string }[];
    };
    expect(detail).toMatchObject({ refundedMinor: 4550, inFlightMinor: 0 });
    expect(detail.refunds.map((r) => r.status)).toEqual(["succeeded"]);

    // What is left can still be refunded; a cent more cannot.
    const tooMuch = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "74.51", reason: "Rest of it" });
    expect(tooMuch.status).toBe(409);
    expect(((await tooMuch.json()) as { error: { message: string } }).error.message).toMatch(/At most USD 74\.50/);
  });

  it("refuses a refund above the amount paid, and two simultaneous refunds cannot add up to more than was paid", async () => {
    const owner = await signedIn(DEMO.owner);
    const other = await signedIn(DEMO.owner);
    const { paymentId } = await paidPaymentWithCharge(5000);
    const over = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "50.01", reason: "More than was paid" });
    expect(over.status).toBe(409);
    expect((await sql(`select 1 from refund where payment_id = $1`, [paymentId])).length).toBe(0);

    const results = await Promise.all([
      owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "30.00", reason: "First half and a bit" }),
      other.post(`/api/office/payments/${paymentId}/refunds`, { amount: "30.00", reason: "Second half and a bit" }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([202, 409]);
    const rows = await sql<{ amount_minor: number }>(`select amount_minor from refund where payment_id = $1 and status <> 'failed'`, [
      paymentId,
    ]);
    expect(rows.reduce((n, r) => n + r.amount_minor, 0)).toBe(3000);
  });

  it("asks for a reason and a sensible amount", async () => {
    const owner = await signedIn(DEMO.owner);
    const { paymentId } = await paidPaymentWithCharge(2000);
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "five", reason: "" });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(Object.keys(error.fields).sort()).toEqual(["amount", "reason"]);
    const cents = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "5.001", reason: "Too precise" });
    expect(cents.status).toBe(400);
    expect(((await cents.json()) as { error: { fields: Record<string, string> } }).error.fields.amount).toMatch(/2 decimal places/);
    expect((await sql(`select 1 from refund where payment_id = $1`, [paymentId])).length).toBe(0);
    const unpaid = await insertPayment({
      jobId: (await insertJob({ state: "approved" })).jobId,
      purpose: "deposit",
      amountMinor: 2000,
      status: "open",
      paidAt: null,
    });
    expect((await owner.post(`/api/office/payments/${unpaid}/refunds`, { amount: "5.00", reason: "Not paid yet" })).status).toBe(409);
    expect((await owner.post(`/api/office/payments/${randomUUID()}/refunds`, { amount: "5.00", reason: "No such payment" })).status).toBe(
      404,
    );
  });

  it("keeps a refund pending when the processor errs, and settles it by asking again with the same idempotency key", async () => {
    // A processor server error leaves the outcome unknown (Stripe's API docs: a 500 may or may not have been
    // acted on; retry with the same idempotency key). So the refund is pending, never "nothing was refunded".
    const owner = await signedIn(DEMO.owner);
    const { paymentId, paymentIntentId } = await paidPaymentWithCharge(8000);
    // The SDK retries once; both attempts fail.
    await failNextProcessorCalls(paymentIntentId, 2);
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "20.00", reason: "Wrong part fitted" });
    expect(res.status).toBe(202);
    const { refundId, status } = (await res.json()) as { refundId: string; status: string };
    expect(status).toBe("pending");
    const rows = await sql<{ status: string; idempotency_key: string }>(
      `select status, idempotency_key from refund where payment_id = $1`,
      [paymentId],
    );
    expect(rows).toEqual([{ status: "pending", idempotency_key: `refund-${refundId}` }]);
    // While it is pending it counts against what is left: the same refund cannot be asked for twice over.
    const again = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "60.01", reason: "Wrong part fitted" });
    expect(again.status).toBe(409);
    expect(((await again.json()) as { error: { message: string } }).error.message).toMatch(/At most USD 60\.00/);

    const check = await owner.post(`/api/office/refunds/${refundId}/check`);
    expect(check.status).toBe(200);
    expect(((await check.json()) as { status: string }).status).toBe("succeeded");
    const [p] = await sql<{ refunded_minor: number }>(`select refunded_minor from payment where id = $1`, [paymentId]);
    expect(p!.refunded_minor).toBe(2000);
    const made = await processorRefunds(paymentIntentId);
    expect(made.map((r) => [r.amount, r.metadata.refundId])).toEqual([[2000, refundId]]);
  });
});

describe("audit log", () => {
  it("filters by actor, entity, action and date, and pages", async () => {
    const owner = await signedIn(DEMO.owner);
    const entityId = `audit-probe-${randomUUID()}`;
    for (let i = 0; i < 3; i++) {
      await sql(
        `insert into audit_event (actor_id, action, entity, entity_id, before, after, at) values ('demo-tech-tomas', 'probe.check', 'probe', $1, $2, $3, $4)`,
        [
          entityId,
          JSON.stringify({ note: "<b>before</b>" }),
          JSON.stringify({ note: `<script>alert(${i})</script>` }),
          new Date(Date.UTC(2014, 4, 10 + i, 12)),
        ],
      );
    }
    const res = await owner.get(
      `/api/office/audit?${new URLSearchParams({ actor: "demo-tech-tomas", entity: "probe", action: "probe.check", from: "2014-05-11", to: "2014-05-12" })}`,
    );
    expect(res.status).toBe(200);
    const body = (await res.json()) as { rows: { entityId: string; actorName: string; after: { note: string } }[]; total: number };
    expect(body.total).toBe(2);
    expect(body.rows.every((r) => r.entityId === entityId && r.actorName === "Tomas Reyne")).toBe(true);
    expect(body.rows[0]!.after.note).toBe("<script>alert(2)</script>");

    const bad = await owner.get("/api/office/audit?from=yesterday");
    expect(bad.status).toBe(400);

    // The page shows stored text as text.
    const page = await owner.get(`/office/audit?${new URLSearchParams({ entity: "probe", action: "probe.check" })}`);
    const html = await page.text();
    expect(html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    expect(html).not.toContain("<script>alert(1)</script>");
  });
});

describe("reports", () => {
  it("shows the same figures as a direct computation over the rows", async () => {
    const owner = await signedIn(DEMO.owner);
    const d = (m: number, day: number, h = 12) => new Date(Date.UTC(2013, m - 1, day, h));
    // Jobs opened in 2013: three returned, two on the bench, one declined.
    const a = await insertJob({ state: "returned", createdAt: d(2, 1), receivedAt: d(2, 3), returnedAt: d(2, 13) }); // 10 days
    const b = await insertJob({ state: "returned", createdAt: d(2, 5), receivedAt: d(2, 10), returnedAt: d(3, 2) }); // 20 days
    const c = await insertJob({ state: "returned", createdAt: d(3, 1), receivedAt: null, returnedAt: d(3, 31) }); // from its first bench day
    await insertHistory(c.jobId, "on_bench", d(3, 16));
    await insertHistory(c.jobId, "on_bench", d(3, 20));
    await insertJob({ state: "on_bench", createdAt: d(4, 2) });
    await insertJob({ state: "on_bench", createdAt: d(4, 9) });
    await insertJob({ state: "declined_by_shop", createdAt: d(5, 9) });
    const pa = await insertPayment({ jobId: a.jobId, purpose: "deposit", amountMinor: 3000, paidAt: d(2, 2) });
    await insertPayment({ jobId: a.jobId, purpose: "balance", amountMinor: 7055, paidAt: d(2, 12) });
    await insertPayment({ jobId: b.jobId, purpose: "deposit", amountMinor: 4500, paidAt: d(2, 6) });
    await insertPayment({ jobId: b.jobId, purpose: "balance", amountMinor: 9000, paidAt: d(3, 1) });
    await insertPayment({ jobId: c.jobId, purpose: "deposit", amountMinor: 2500, status: "open", paidAt: null });
    await insertRefund({ paymentId: pa, amountMinor: 1000, status: "succeeded", settledAt: d(3, 5) });
    await insertRefund({ paymentId: pa, amountMinor: 500, status: "failed", settledAt: d(3, 6) });

    const res = await owner.get("/api/office/reports?from=2013-01&to=2013-12");
    expect(res.status).toBe(200);
    const r = (await res.json()) as {
      range: { from: string; to: string };
      jobsPerState: { state: string; count: number }[];
      turnaround: { jobs: number; medianDays: number; byMonth: { month: string; jobs: number; medianDays: number | null }[] };
      money: { month: string; depositsMinor: number; balancesMinor: number; refundsMinor: number; netMinor: number }[];
    };
    expect(r.range).toEqual({ from: "2013-01", to: "2013-12" });

    const states = await sql<{ state: string; n: number }>(
      `select state::text, count(*)::int as n from job where created_at >= '2013-01-01T00:00:00Z' and created_at < '2014-01-01T00:00:00Z' group by state`,
    );
    const expectedStates = Object.fromEntries(states.map((s) => [s.state, s.n]));
    expect(Object.fromEntries(r.jobsPerState.filter((s) => s.count > 0).map((s) => [s.state, s.count]))).toEqual(expectedStates);
    expect(expectedStates).toMatchObject({ returned: 3, on_bench: 2, declined_by_shop: 1 });

    const spans = await sql<{ days: number; month: string }>(`
      select extract(epoch from (j.returned_at - coalesce(j.received_at, (select min(h.at) from job_state_history h where h.job_id = j.id and h.to_state = 'on_bench'))))::float8 / 86400 as days,
             to_char(j.returned_at at time zone 'UTC', 'YYYY-MM') as month
      from job j where j.returned_at >= '2013-01-01T00:00:00Z' and j.returned_at < '2014-01-01T00:00:00Z'`);
    const median = (xs: number[]) => {
      const s = [...xs].sort((x, y) => x - y);
      const m = Math.floor(s.length / 2);
      return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
    };
    expect(r.turnaround.jobs).toBe(spans.length);
    expect(r.turnaround.medianDays).toBeCloseTo(median(spans.map((s) => s.days)), 9);
    expect(r.turnaround.medianDays).toBeCloseTo(15, 9); // 10, 15 and 20 days
    const march = r.turnaround.byMonth.find((m) => m.month === "2013-03")!;
    expect(march.jobs).toBe(2);
    expect(march.medianDays).toBeCloseTo(median(spans.filter((s) => s.month === "2013-03").map((s) => s.days)), 9);
    expect(r.turnaround.byMonth).toHaveLength(12);

    const paid = await sql<{ month: string; purpose: string; total: number }>(`
      select to_char(paid_at at time zone 'UTC', 'YYYY-MM') as month, purpose::text, sum(amount_minor)::int as total
      from payment where status = 'paid' and paid_at >= '2013-01-01T00:00:00Z' and paid_at < '2014-01-01T00:00:00Z' group by 1, 2`);
    const refunded = await sql<{ month: string; total: number }>(`
      select to_char(settled_at at time zone 'UTC', 'YYYY-MM') as month, sum(amount_minor)::int as total
      from refund where status = 'succeeded' and settled_at >= '2013-01-01T00:00:00Z' and settled_at < '2014-01-01T00:00:00Z' group by 1`);
    for (const m of r.money) {
      const dep = paid.find((p) => p.month === m.month && p.purpose === "deposit")?.total ?? 0;
      const bal = paid.find((p) => p.month === m.month && p.purpose === "balance")?.total ?? 0;
      const ref = refunded.find((p) => p.month === m.month)?.total ?? 0;
      expect(m, m.month).toEqual({ month: m.month, depositsMinor: dep, balancesMinor: bal, refundsMinor: ref, netMinor: dep + bal - ref });
    }
    expect(r.money.find((m) => m.month === "2013-02")).toMatchObject({ depositsMinor: 7500, balancesMinor: 7055, refundsMinor: 0 });
    expect(r.money.find((m) => m.month === "2013-03")).toMatchObject({
      depositsMinor: 0,
      balancesMinor: 9000,
      refundsMinor: 1000,
      netMinor: 8000,
    });

    // The page prints the same numbers in its tables.
    const html = await (await owner.get("/office/reports?from=2013-01&to=2013-12")).text();
    expect(html).toContain("USD 145.55");
    expect(html).toMatch(/data-testid="median-turnaround"[^>]*>15\.0</);
  });
});
