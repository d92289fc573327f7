import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type pg from "pg";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql, testPool } from "../support/db";
import type { TestClient } from "../support/http";
import { approveAndPayDeposit, createJob } from "./bench-fixtures";

// Bench writes against completion. Completion reads the sheet, then moves the job; a reading or an unticked
// line committed between those two steps would leave a "balance due" job with a failing sheet. The test makes
// that window wide and certain: it holds a lock on the state history table, which completion writes after its
// gate, so completion stops exactly there; then it sends the bench write and only then lets completion go.
// The rule checked is the workshop's own (common practice): a set is not released with a failing reading.

type Sheet = { requirements: { key: string; unit: string; nominal: number | null }[]; tasks: { code: string }[] };

let tech: TestClient;
beforeAll(async () => {
  tech = await signedIn(DEMO.tech);
});
afterAll(async () => {
  await closeTestPool();
});

async function jobInFinalChecks(): Promise<{ jobId: string; tasks: string[] }> {
  const { jobId } = await createJob({ state: "in_triage", technicianEmail: DEMO.tech.email });
  const draft = (await (await tech.get(`/api/bench/jobs/${jobId}/estimate`)).json()) as { lines: unknown[] };
  expect(
    (await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: draft.lines } })).status,
  ).toBe(200);
  expect((await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version: 1 })).status).toBe(200);
  await approveAndPayDeposit(jobId);
  expect((await tech.post(`/api/bench/jobs/${jobId}/start-bench`)).status).toBe(200);
  const sheet = (await (await tech.get(`/api/bench/jobs/${jobId}/sheet`)).json()) as Sheet;
  for (const r of sheet.requirements) {
    const value = r.unit === "mA" ? 0.12 : (r.nominal ?? 120);
    expect((await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: r.key, value })).status).toBe(200);
  }
  for (const t of sheet.tasks) expect((await tech.post(`/api/bench/jobs/${jobId}/tasks`, { code: t.code, done: true })).status).toBe(200);
  expect((await tech.post(`/api/bench/jobs/${jobId}/final-checks`)).status).toBe(200);
  return { jobId, tasks: sheet.tasks.map((t) => t.code) };
}

/** Backends of the app waiting for a lock, other than the test's own connection. */
async function lockWaiters(holder: number): Promise<number> {
  const [row] = await sql<{ n: number }>(
    `select count(*)::int as n from pg_stat_activity where wait_event_type = 'Lock' and datname = current_database() and pid <> $1`,
    [holder],
  );
  return row!.n;
}

async function until(probe: () => Promise<boolean>, what: string, timeoutMs = 15_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await probe())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** Runs completion held just after its gate, sends `write` meanwhile, then releases completion. */
async function raceCompletion(jobId: string, write: () => Promise<Response>) {
  const client: pg.PoolClient = await testPool().connect();
  let settled = false;
  try {
    await client.query("begin");
    await client.query("lock table job_state_history in exclusive mode");
    const { rows } = await client.query<{ pid: number }>("select pg_backend_pid() as pid");
    const holder = rows[0]!.pid;
    const completion = tech.post(`/api/bench/jobs/${jobId}/complete`);
    await until(async () => (await lockWaiters(holder)) >= 1, "completion to pass its gate and wait");
    const pending = write().finally(() => {
      settled = true;
    });
    // Either the write finishes on its own (nothing stops it), or it waits on the job behind completion.
    await until(async () => settled || (await lockWaiters(holder)) >= 2, "the bench write to finish or wait");
    await client.query("commit");
    const [done, wrote] = await Promise.all([completion, pending]);
    return { completion: done, write: wrote };
  } finally {
    await client.query("rollback").catch(() => undefined);
    client.release();
  }
}

describe("bench writes and completion are decided one after the other", () => {
  it("a failing reading sent during completion cannot commit into a completed job", async () => {
    const { jobId } = await jobInFinalChecks();
    const { completion, write } = await raceCompletion(jobId, () =>
      tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "leakage.plug-a", value: 0.8 }),
    );
    expect(completion.status).toBe(200);
    expect(write.status).toBe(409);
    const [job] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    expect(job!.state).toBe("balance_due");
    const failing = await sql("select key from reading where job_id = $1 and verdict = 'fail'", [jobId]);
    expect(failing).toEqual([]);
  });

  it("a checklist line unticked during completion cannot reopen a completed job's sheet", async () => {
    const { jobId, tasks } = await jobInFinalChecks();
    const { completion, write } = await raceCompletion(jobId, () =>
      tech.post(`/api/bench/jobs/${jobId}/tasks`, { code: tasks[0], done: false }),
    );
    expect(completion.status).toBe(200);
    expect(write.status).toBe(409);
    const open = await sql("select code from job_task where job_id = $1 and done_at is null", [jobId]);
    expect(open).toEqual([]);
  });

  it("a reading that lands first stops completion with its reason", async () => {
    const { jobId } = await jobInFinalChecks();
    const [reading, completion] = await Promise.all([
      tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "leakage.plug-a", value: 0.8 }),
      new Promise((r) => setTimeout(r, 30)).then(() => tech.post(`/api/bench/jobs/${jobId}/complete`)),
    ]);
    // Whichever went first, the job never ends up completed with a failing reading stored.
    const [job] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    const failing = await sql("select key from reading where job_id = $1 and verdict = 'fail'", [jobId]);
    if (reading.status === 200) {
      expect(completion.status).toBe(409);
      expect(job!.state).toBe("final_checks");
      expect(failing.length).toBe(1);
    } else {
      expect(completion.status).toBe(200);
      expect(job!.state).toBe("balance_due");
      expect(failing).toEqual([]);
    }
  });
});
