// PostgreSQL stopped or frozen under the running app. Expected answers follow HTTP's own rules: 503 Service
// Unavailable "indicates that the server is currently unable to handle the request due to a temporary
// overload or scheduled maintenance", and Retry-After says how long to wait (RFC 9110, sections 15.6.4 and
// 10.2.3). Liveness stays up while readiness says the database is missing (common practice for health checks).
import { afterAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { testEnv } from "../support/env";
import { TestClient } from "../support/http";
import { freezePostgres, startPostgres, stopPostgres, thawPostgres } from "../support/postgres";

async function timed(call: () => Promise<Response>): Promise<{ res: Response; ms: number; body: string }> {
  const t0 = Date.now();
  const res = await call();
  const body = await res.text();
  return { res, ms: Date.now() - t0, body };
}

async function waitUntilReady(): Promise<void> {
  await expect
    .poll(async () => (await fetch(new URL("/api/ready", testEnv.appUrl)).catch(() => null))?.status, { timeout: 60_000, interval: 250 })
    .toBe(200);
}

function expectUnavailableJson(r: { res: Response; body: string }, what: string) {
  expect(r.res.status, `${what}: ${r.body.slice(0, 200)}`).toBe(503);
  expect(Number(r.res.headers.get("retry-after")), what).toBeGreaterThan(0);
  expect(r.res.headers.get("content-type"), what).toContain("application/json");
  const json = JSON.parse(r.body) as { error: { code: string; message: string } };
  expect(json.error.code, what).toBe("unavailable");
  expect(json.error.message, what).toMatch(/cannot be reached/);
}

// Every call the outage makes, answered while the database is missing.
async function duringOutage(customer: TestClient) {
  const anon = new TestClient();
  return Promise.all([
    timed(() => anon.post("/api/auth/sign-in/email", DEMO.customer2, { signal: AbortSignal.timeout(30_000) })),
    timed(() => customer.get("/api/portal/jobs", { signal: AbortSignal.timeout(30_000) })),
    timed(() => customer.get("/portal", { signal: AbortSignal.timeout(30_000) })),
    timed(() => anon.get("/api/ready", { signal: AbortSignal.timeout(30_000) })),
    timed(() => anon.get("/api/health", { signal: AbortSignal.timeout(30_000) })),
  ]);
}

function expectOutageAnswers([signIn, api, page, ready, health]: Awaited<ReturnType<typeof duringOutage>>) {
  expectUnavailableJson(signIn, "sign-in");
  expectUnavailableJson(api, "JSON API");
  expect(page.res.status, page.body.slice(0, 300)).toBe(503);
  expect(Number(page.res.headers.get("retry-after"))).toBeGreaterThan(0);
  expect(page.body).toContain("cannot be reached");
  expect(ready.res.status).toBe(503);
  expect(Number(ready.res.headers.get("retry-after"))).toBeGreaterThan(0);
  expect(health.res.status).toBe(200);
}

// Whatever happens, the cluster is left thawed for the files that follow.
afterAll(() => thawPostgres());

describe("when PostgreSQL is stopped", () => {
  it("answers 503 with Retry-After and a clear message on sign-in, JSON and pages, and readiness fails while liveness holds", async () => {
    const customer = await signedIn(DEMO.customer);
    expect((await customer.get("/api/ready")).status).toBe(200);
    stopPostgres();
    try {
      const answers = await duringOutage(customer);
      expectOutageAnswers(answers);
      // A stopped server refuses connections at once: no one waits for a timeout.
      for (const a of answers) expect(a.ms).toBeLessThan(8_000);
    } finally {
      startPostgres();
    }
    await waitUntilReady();
    expect((await customer.get("/api/portal/jobs")).status).toBe(200);
    expect((await new TestClient().post("/api/auth/sign-in/email", DEMO.customer2)).status).toBe(200);
  }, 120_000);
});

describe("when PostgreSQL is frozen", () => {
  it("gives up within the configured timeouts and answers 503 instead of hanging", async () => {
    const customer = await signedIn(DEMO.customer);
    await waitUntilReady();
    freezePostgres();
    let answers: Awaited<ReturnType<typeof duringOutage>>;
    try {
      answers = await duringOutage(customer);
    } finally {
      thawPostgres();
    }
    expectOutageAnswers(answers);
    // Statement timeout 8 s plus the client's 2 s margin, then a 2 s probe (lib/server/env.ts defaults).
    for (const a of answers) expect(a.ms).toBeLessThan(15_000);
    await waitUntilReady();
    expect((await customer.get("/api/portal/jobs")).status).toBe(200);
  }, 120_000);
});
