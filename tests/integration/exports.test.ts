// The office's CSV exports, parsed back with the same CSV library (papaparse) and summed against the database.
// Quoting follows RFC 4180; cells a spreadsheet would run as formulas are escaped with a leading apostrophe, as
// OWASP's "CSV Injection" guidance recommends for files opened in spreadsheet programs.
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer, signedIn } from "../support/accounts";
import { sql } from "../support/db";
import { TestClient } from "../support/http";
import { seedJobWithEstimate } from "../fixtures/jobs";

// Ten years back: the longest range an export covers, and before any demo or test row.
const FROM = new Date(Date.now() - 3_600 * 86_400_000).toISOString().slice(0, 10);
const TO = new Date(Date.now() + 2 * 86_400_000).toISOString().slice(0, 10);
const RANGE = `from=${FROM}&to=${TO}`;
// The same range as instants, for the database's side of each check: from the start of FROM to the end of TO.
const START = `${FROM}T00:00:00Z`;
const END = new Date(Date.parse(`${TO}T00:00:00Z`) + 86_400_000).toISOString();

let owner: TestClient;

function parse(text: string): Record<string, string>[] {
  const r = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
  expect(r.errors).toEqual([]);
  return r.data;
}

/** "123.45" → 12345 for a two-digit currency: exact, by the digits. */
function minorOf(amount: string, exponent = 2): number {
  const [whole, frac = ""] = amount.split(".");
  return Number(whole) * 10 ** exponent + Number(frac.padEnd(exponent, "0") || "0");
}

beforeAll(async () => {
  owner = await signedIn(DEMO.owner);
});

describe("office exports", () => {
  it("answers the owner text/csv whose payments and refunds add up to the database's", async () => {
    const res = await owner.get(`/api/office/exports/payments.csv?${RANGE}`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/csv");
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename="payments-\d{4}-\d{2}-\d{2}-to-\d{4}-\d{2}-\d{2}\.csv"/);
    const rows = parse(await res.text());
    const [db] = await sql<{ paid: number; refunded: number; n: number; r: number }>(
      `select (select coalesce(sum(amount_minor), 0)::int from payment where paid_at >= $1 and paid_at < $2 and status in ('paid', 'duplicate') and currency = 'USD') as paid,
              (select coalesce(sum(f.amount_minor), 0)::int from refund f join payment p on p.id = f.payment_id
                where f.status = 'succeeded' and f.settled_at >= $1 and f.settled_at < $2 and p.currency = 'USD') as refunded,
              (select count(*)::int from payment where paid_at >= $1 and paid_at < $2 and status in ('paid', 'duplicate')) as n,
              (select count(*)::int from refund where status = 'succeeded' and settled_at >= $1 and settled_at < $2) as r`,
      [START, END],
    );
    const usd = rows.filter((r) => r.currency === "USD");
    expect(rows.filter((r) => r.kind === "payment")).toHaveLength(db!.n);
    expect(rows.filter((r) => r.kind === "refund")).toHaveLength(db!.r);
    expect(usd.filter((r) => r.kind === "payment").reduce((s, r) => s + minorOf(r.amount!), 0)).toBe(db!.paid);
    expect(usd.filter((r) => r.kind === "refund").reduce((s, r) => s + minorOf(r.amount!), 0)).toBe(db!.refunded);
    expect(db!.n).toBeGreaterThan(0); // the demo has paid jobs
    // Each refund row names its kind as the database holds it; other rows leave the column empty.
    const [kinds] = await sql<{ reductions: number }>(
      `select count(*)::int as reductions from refund where status = 'succeeded' and kind = 'reduction' and settled_at >= $1 and settled_at < $2`,
      [START, END],
    );
    expect(rows.filter((r) => r.kind === "refund" && r.refund_kind === "reduction")).toHaveLength(kinds!.reductions);
    expect(rows.filter((r) => r.kind === "refund").every((r) => r.refund_kind === "return" || r.refund_kind === "reduction")).toBe(true);
    expect(rows.filter((r) => r.kind !== "refund").every((r) => r.refund_kind === "")).toBe(true);
  });

  it("lists the jobs opened in the range, the tax of jobs paid in full by month, and the audit log", async () => {
    const jobs = parse(await (await owner.get(`/api/office/exports/jobs.csv?${RANGE}`)).text());
    const [count] = await sql<{ n: number }>("select count(*)::int as n from job where created_at >= $1 and created_at < $2", [START, END]);
    expect(jobs).toHaveLength(count!.n);
    expect(jobs.every((j) => /^KL-\d{4,}$/.test(j.job!))).toBe(true);

    const tax = parse(await (await owner.get(`/api/office/exports/tax.csv?${RANGE}`)).text());
    const [t] = await sql<{ labour: number; parts: number; jobs: number }>(
      `select coalesce(sum((r.pricing->>'labourTaxMinor')::int), 0)::int as labour, coalesce(sum((r.pricing->>'partsTaxMinor')::int), 0)::int as parts,
              count(*)::int as jobs
       from job j join lateral (select pricing, currency from estimate_revision where job_id = j.id and status = 'approved' order by revision desc limit 1) r on true
       where r.currency = 'USD'
         and (select min(h.at) from job_state_history h where h.job_id = j.id and h.to_state = 'paid_in_full') >= $1
         and (select min(h.at) from job_state_history h where h.job_id = j.id and h.to_state = 'paid_in_full') < $2`,
      [START, END],
    );
    const usdTax = tax.filter((r) => r.currency === "USD");
    expect(usdTax.reduce((s, r) => s + minorOf(r.labour_tax!), 0)).toBe(t!.labour);
    expect(usdTax.reduce((s, r) => s + minorOf(r.parts_tax!), 0)).toBe(t!.parts);
    expect(usdTax.reduce((s, r) => s + Number(r.jobs_paid_in_full), 0)).toBe(t!.jobs);
    for (const r of usdTax) expect(minorOf(r.total_tax!)).toBe(minorOf(r.labour_tax!) + minorOf(r.parts_tax!));
    expect(usdTax.every((r) => /^\d{4}-\d{2}$/.test(r.month!))).toBe(true);

    const [before] = await sql<{ n: number }>("select count(*)::int as n from audit_event where at >= $1 and at < $2", [START, END]);
    const audit = parse(await (await owner.get(`/api/office/exports/audit.csv?${RANGE}`)).text());
    // Other requests may add rows meanwhile (a sign-in, say), never remove them.
    expect(audit.length).toBeGreaterThanOrEqual(before!.n);
    expect(Object.keys(audit[0]!)).toEqual(["at_utc", "actor", "actor_email", "action", "entity", "entity_id", "before", "after"]);
  });

  it("keeps a customer's typed name from running as a spreadsheet formula", async () => {
    const c = await newCustomer("formula");
    await sql(`update "user" set name = '=HYPERLINK("http://example.com","x")' where email = $1`, [c.email]);
    const job = await seedJobWithEstimate({ email: c.email });
    const jobs = parse(await (await owner.get(`/api/office/exports/jobs.csv?${RANGE}`)).text());
    const [n] = await sql<{ number: number }>("select number from job where id = $1", [job.jobId]);
    const row = jobs.find((j) => j.job === `KL-${String(n!.number).padStart(4, "0")}`);
    expect(row?.customer).toBe(`'=HYPERLINK("http://example.com","x")`);
  });

  it("narrows to the days asked for, both included", async () => {
    const [one] = await sql<{ day: string; n: number }>(
      `select to_char(created_at at time zone 'UTC', 'YYYY-MM-DD') as day, count(*) over (partition by to_char(created_at at time zone 'UTC', 'YYYY-MM-DD'))::int as n
       from job order by created_at limit 1`,
    );
    const rows = parse(await (await owner.get(`/api/office/exports/jobs.csv?from=${one!.day}&to=${one!.day}`)).text());
    expect(rows).toHaveLength(one!.n);
  });

  it("refuses a bad range with the field named, and answers 404 to everyone but the owner", async () => {
    const bad = await owner.get("/api/office/exports/payments.csv?from=2026-02-30&to=2026-03-01");
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { fields: Record<string, string> } }).error.fields.from).toMatch(
      /^From: write the day as YYYY-MM-DD/,
    );
    const backwards = await owner.get("/api/office/exports/payments.csv?from=2026-03-02&to=2026-03-01");
    expect(((await backwards.json()) as { error: { fields: Record<string, string> } }).error.fields.to).toMatch(
      /^To: choose a day on or after/,
    );
    expect((await owner.get(`/api/office/exports/secrets.csv?${RANGE}`)).status).toBe(404);
    for (const who of [await signedIn(DEMO.tech), await signedIn(DEMO.customer), new TestClient()])
      expect((await who.get(`/api/office/exports/payments.csv?${RANGE}`)).status).toBe(404);
  });
});
