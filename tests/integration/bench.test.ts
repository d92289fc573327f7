import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { waitForMail } from "../support/mail";
import { approveAndPayDeposit, AURELIAN_PROFILE, CORVANE_PROFILE, createJob, historyAndAudit, userId } from "./bench-fixtures";

type QueueRow = {
  id: string;
  number: number;
  state: string;
  maker: string;
  model: string;
  customerName: string;
  technicianId: string | null;
};
type QueuePage = { rows: QueueRow[]; total: number; pageCount: number };
type SheetReq = { key: string; lineCode: string; unit: string; nominal: number | null; verdict: string; value: number | null };
type Sheet = {
  requirements: SheetReq[];
  tasks: { code: string; doneAt: string | null }[];
  reasons: { kind: string; key: string; text: string }[];
};

let tech: TestClient;
let techId: string;

beforeAll(async () => {
  tech = await signedIn(DEMO.tech);
  techId = await userId(DEMO.tech.email);
});
afterAll(async () => {
  await closeTestPool();
});

const jobNo = (n: number) => `KL-${String(n).padStart(4, "0")}`;

async function queue(client: TestClient, params: Record<string, string>): Promise<QueuePage> {
  const res = await client.get(`/api/bench/queue?${new URLSearchParams(params)}`);
  expect(res.status).toBe(200);
  return (await res.json()) as QueuePage;
}

async function sheet(jobId: string): Promise<Sheet> {
  const res = await tech.get(`/api/bench/jobs/${jobId}/sheet`);
  expect(res.status).toBe(200);
  return (await res.json()) as Sheet;
}

async function sendFirstEstimate(jobId: string) {
  const v = (await (await tech.get(`/api/bench/jobs/${jobId}/estimate`)).json()) as { lines: unknown[] };
  expect((await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: v.lines } })).status).toBe(
    200,
  );
  expect((await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version: 1 })).status).toBe(200);
}

describe("the queue", () => {
  it("searches by job number, maker, model and owner, filters by state and technician, sorts and pages", async () => {
    const model = `Q-${Date.now().toString(36)}`;
    const a = await createJob({
      maker: "Corvane",
      model,
      profile: CORVANE_PROFILE as unknown as Record<string, unknown>,
      state: "in_triage",
      technicianEmail: DEMO.tech.email,
    });
    const b = await createJob({ maker: "Haldane", model, state: "requested", customerEmail: DEMO.customer2.email });

    const byNumber = await queue(tech, { q: jobNo(a.number) });
    expect(byNumber.rows.map((r) => r.id)).toEqual([a.jobId]);
    const byBareNumber = await queue(tech, { q: String(b.number) });
    expect(byBareNumber.rows.map((r) => r.id)).toContain(b.jobId);

    const byModel = await queue(tech, { q: model });
    expect(byModel.rows.map((r) => r.id).sort()).toEqual([a.jobId, b.jobId].sort());
    const byMaker = await queue(tech, { q: `haldane ${model}` });
    expect(byMaker.rows.map((r) => r.id)).toEqual([b.jobId]);
    const byOwner = await queue(tech, { q: "jonah", pageSize: "100" });
    expect(byOwner.rows.map((r) => r.id)).toContain(b.jobId);
    expect(byOwner.rows.map((r) => r.id)).not.toContain(a.jobId);

    const triage = await queue(tech, { q: model, states: "in_triage" });
    expect(triage.rows.map((r) => r.id)).toEqual([a.jobId]);
    const mine = await queue(tech, { q: model, technician: "me" });
    expect(mine.rows.map((r) => r.id)).toEqual([a.jobId]);
    const unassigned = await queue(tech, { q: model, technician: "none" });
    expect(unassigned.rows.map((r) => r.id)).toEqual([b.jobId]);

    const asc = await queue(tech, { q: model, sort: "number", dir: "asc" });
    expect(asc.rows.map((r) => r.number)).toEqual([a.number, b.number].sort((x, y) => x - y));
    const desc = await queue(tech, { q: model, sort: "number", dir: "desc" });
    expect(desc.rows.map((r) => r.number)).toEqual([a.number, b.number].sort((x, y) => y - x));

    const page1 = await queue(tech, { q: model, pageSize: "5", page: "1" });
    expect(page1.total).toBe(2);
    expect(page1.pageCount).toBe(1);
    // The total is the whole filter's, whichever page is asked for, including one past the end.
    const past = await queue(tech, { q: model, pageSize: "5", page: "3" });
    expect(past.rows).toHaveLength(0);
    expect(past.total).toBe(2);
    expect(past.pageCount).toBe(1);
    expect(JSON.stringify(page1.rows[0])).not.toContain('"total"');

    const bad = await tech.get("/api/bench/queue?states=nonsense");
    expect(bad.status).toBe(400);
  });

  it("assigns a technician and refuses someone who is not staff", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const tech2Id = await userId(DEMO.tech2.email);
    const ok = await tech.post(`/api/bench/jobs/${jobId}/assign`, { technicianId: tech2Id });
    expect(ok.status).toBe(200);
    const [row] = await sql<{ technician_id: string }>("select technician_id from job where id = $1", [jobId]);
    expect(row!.technician_id).toBe(tech2Id);
    const customerId = await userId(DEMO.customer.email);
    const bad = await tech.post(`/api/bench/jobs/${jobId}/assign`, { technicianId: customerId });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { fields: Record<string, string> } }).error.fields.technicianId).toBeTruthy();
    const audits = await sql("select id from audit_event where entity_id = $1 and action = 'job.assign'", [jobId]);
    expect(audits).toHaveLength(1);
  });

  it("answers every filter shape, whether the page or the API asked first for its own", async () => {
    // The queue page renders its first page on the server and the API answers filters afterwards: two parts of
    // the app asking one database connection for different statements must not trip over each other
    // (PostgreSQL refuses a prepared-statement name reused for another statement on a connection).
    const { number } = await createJob({ state: "in_triage" });
    for (let round = 0; round < 3; round++) {
      expect((await tech.get("/bench")).status).toBe(200);
      expect((await queue(tech, { q: jobNo(number) })).rows.map((r) => r.number)).toContain(number);
      expect((await queue(tech, { states: "in_triage", sort: "number", dir: "asc" })).rows.length).toBeGreaterThan(0);
      expect(typeof (await queue(tech, { technician: "none", includeClosed: "1" })).total).toBe("number");
    }
  });

  it("is for staff only", async () => {
    const customer = await signedIn(DEMO.customer);
    expect((await customer.get("/api/bench/queue")).status).toBe(404);
    expect((await new TestClient().get("/api/bench/queue")).status).toBe(401);
    const { jobId } = await createJob();
    expect((await customer.get(`/api/bench/jobs/${jobId}`)).status).toBe(404);
    expect((await customer.post(`/api/bench/jobs/${jobId}/triage`)).status).toBe(404);
    expect((await tech.get("/api/bench/jobs/not-a-job")).status).toBe(404);
  });
});

describe("triage", () => {
  it("picks up a request, corrects the profile, asks the owner a question", async () => {
    const { jobId, number } = await createJob();
    const start = await tech.post(`/api/bench/jobs/${jobId}/triage`);
    expect(start.status).toBe(200);
    const [row] = await sql<{ state: string; technician_id: string }>("select state, technician_id from job where id = $1", [jobId]);
    expect(row).toEqual({ state: "in_triage", technician_id: techId });

    const badProfile = await tech.request(`/api/bench/jobs/${jobId}/profile`, {
      method: "PUT",
      json: {
        maker: "Aurelian",
        model: "5T-48",
        year: 1948,
        profile: { ...AURELIAN_PROFILE, bands: [{ kind: "MW", lowKHz: 1600, highKHz: 540, ifKHz: 455 }] },
      },
    });
    expect(badProfile.status).toBe(400);
    const fields = ((await badProfile.json()) as { error: { fields: Record<string, string> } }).error.fields;
    expect(fields["profile.bands.0.highKHz"]).toMatch(/above the low end/);

    const good = await tech.request(`/api/bench/jobs/${jobId}/profile`, {
      method: "PUT",
      json: { maker: "Aurelian", model: "5T-48", year: 1948, profile: { ...AURELIAN_PROFILE, seleniumRectifier: true, electrolytics: 3 } },
    });
    expect(good.status).toBe(200);
    const [set] = await sql<{ profile: { seleniumRectifier: boolean; electrolytics: number }; model: string }>(
      "select s.profile, s.model from radio_set s join job j on j.set_id = s.id where j.id = $1",
      [jobId],
    );
    expect(set!.model).toBe("5T-48");
    expect(set!.profile.seleniumRectifier).toBe(true);
    expect(set!.profile.electrolytics).toBe(3);
    // The checklist follows the corrected profile.
    const est = (await (await tech.get(`/api/bench/jobs/${jobId}/estimate`)).json()) as { lines: { code: string; quantity: number }[] };
    expect(est.lines.map((l) => l.code)).toContain("safety.selenium");
    expect(est.lines.find((l) => l.code === "recap.electrolytic")!.quantity).toBe(3);

    const short = await tech.post(`/api/bench/jobs/${jobId}/question`, { question: "Hm?", idempotencyKey: randomUUID() });
    expect(short.status).toBe(400);
    const started = Date.now();
    const ask = await tech.post(`/api/bench/jobs/${jobId}/question`, {
      question: "Is the original line cord still fitted, or has it been replaced?",
      idempotencyKey: randomUUID(),
    });
    expect(ask.status).toBe(200);
    const [after] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    expect(after!.state).toBe("awaiting_owner");
    const msgs = await sql<{ body: string; is_question: boolean; internal: boolean }>(
      "select body, is_question, internal from message where job_id = $1",
      [jobId],
    );
    expect(msgs).toContainEqual({
      body: "Is the original line cord still fitted, or has it been replaced?",
      is_question: true,
      internal: false,
    });
    const mail = await waitForMail(DEMO.customer.email, `(${jobNo(number)})`, { after: started - 1000 });
    expect(mail.subject).toMatch(/question/i);
    expect(mail.text).toContain("original line cord");
    // A second question while waiting is refused.
    expect(
      (await tech.post(`/api/bench/jobs/${jobId}/question`, { question: "And the dial glass?", idempotencyKey: randomUUID() })).status,
    ).toBe(409);
  });

  it("declines a job with a reason the owner can read", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const noReason = await tech.post(`/api/bench/jobs/${jobId}/decline`, { reason: "" });
    expect(noReason.status).toBe(400);
    const res = await tech.post(`/api/bench/jobs/${jobId}/decline`, { reason: "The chassis has fire damage beyond economic repair." });
    expect(res.status).toBe(200);
    const [row] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    expect(row!.state).toBe("declined_by_shop");
    const msgs = await sql<{ body: string; internal: boolean }>("select body, internal from message where job_id = $1", [jobId]);
    expect(msgs[0]!.internal).toBe(false);
    expect(msgs[0]!.body).toContain("fire damage");
  });
});

describe("bench sheet, completion and return", () => {
  it("judges readings, refuses completion with reasons until leakage passes, then asks for the balance and records the return", async () => {
    const { jobId, number } = await createJob({ state: "in_triage", technicianEmail: DEMO.tech.email });
    await sendFirstEstimate(jobId);
    // Readings wait until the set is on the bench.
    expect((await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "leakage.plug-a", value: 0.1 })).status).toBe(409);
    const { totalMinor, depositMinor } = await approveAndPayDeposit(jobId);
    expect((await tech.post(`/api/bench/jobs/${jobId}/start-bench`)).status).toBe(200);

    const s0 = await sheet(jobId);
    const keys = s0.requirements.map((r) => r.key);
    expect(keys).toEqual(
      expect.arrayContaining([
        "if.peak.455",
        "band.0.lo.low",
        "band.0.lo.high",
        "band.0.track.0",
        "band.0.track.1",
        "band.0.track.2",
        "band.0.edge.low",
        "band.0.edge.high",
        "bplus",
        "bplus.mains",
        "leakage.plug-a",
        "leakage.plug-b",
      ]),
    );
    expect(s0.requirements.every((r) => r.verdict === "missing")).toBe(true);

    const unknown = await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "band.7.edge.low", value: 500 });
    expect(unknown.status).toBe(400);
    const notNumber = await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "bplus", value: "lots" });
    expect(notNumber.status).toBe(400);
    // Readings are physical (common practice): a negative frequency, or 0.58 for the 580 kHz mark, is bad input.
    for (const value of [-548, 0.58]) {
      const bad = await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "band.0.track.0", value });
      expect(bad.status, String(value)).toBe(400);
      expect(((await bad.json()) as { error: { fields: Record<string, string> } }).error.fields.value).toBeTruthy();
    }
    const badStored = await sql("select 1 from reading where job_id = $1 and key = 'band.0.track.0'", [jobId]);
    expect(badStored).toHaveLength(0);

    const fail = await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "leakage.plug-a", value: 0.8 });
    expect(fail.status).toBe(200);
    expect(((await fail.json()) as { verdict: string }).verdict).toBe("fail");
    const edge = await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "band.0.edge.low", value: 548 });
    expect(((await edge.json()) as { verdict: string }).verdict).toBe("pass");
    const edgeFar = await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: "band.0.edge.high", value: 1640 });
    expect(((await edgeFar.json()) as { verdict: string }).verdict).toBe("fail");
    const [stored] = await sql<{ verdict: string; tolerance_text: string; recorded_by: string }>(
      "select verdict, tolerance_text, recorded_by from reading where job_id = $1 and key = 'leakage.plug-a'",
      [jobId],
    );
    expect(stored).toEqual({ verdict: "fail", tolerance_text: "at most 0.5 mA", recorded_by: techId });

    // Final checks wait for every line.
    const early = await tech.post(`/api/bench/jobs/${jobId}/final-checks`);
    expect(early.status).toBe(409);
    for (const t of s0.tasks) expect((await tech.post(`/api/bench/jobs/${jobId}/tasks`, { code: t.code, done: true })).status).toBe(200);
    const ticked = await sql<{ done_by: string | null; done_at: string | null }>(
      "select done_by, done_at from job_task where job_id = $1",
      [jobId],
    );
    expect(ticked.every((t) => t.done_by === techId && t.done_at !== null)).toBe(true);
    expect((await tech.post(`/api/bench/jobs/${jobId}/final-checks`)).status).toBe(200);

    // Complete: refused, with every reason.
    const refused = await tech.post(`/api/bench/jobs/${jobId}/complete`);
    expect(refused.status).toBe(409);
    const reasons = ((await refused.json()) as { error: { fields: Record<string, string> } }).error.fields;
    expect(reasons["leakage.plug-a"]).toMatch(/outside the tolerance/);
    expect(reasons["leakage.plug-b"]).toMatch(/not recorded/);
    expect(reasons["band.0.edge.high"]).toMatch(/outside/);
    expect(reasons["if.peak.455"]).toMatch(/not recorded/);
    const [still] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    expect(still!.state).toBe("final_checks");

    // Every reading on its nominal, leakage well inside the limit.
    // B+ with no schematic figure and the mains beside it are recorded, never passed (common practice).
    for (const r of s0.requirements) {
      const value = r.unit === "mA" ? 0.12 : (r.nominal ?? 120);
      const res = await tech.post(`/api/bench/jobs/${jobId}/readings`, { key: r.key, value });
      expect(((await res.json()) as { verdict: string }).verdict, r.key).toBe(r.nominal === null && r.unit === "V" ? "recorded" : "pass");
    }
    const started = Date.now();
    const done = await tech.post(`/api/bench/jobs/${jobId}/complete`);
    expect(done.status).toBe(200);
    const balance = (await done.json()) as { balanceMinor: number };
    expect(balance.balanceMinor).toBe(totalMinor - depositMinor);
    const [due] = await sql<{ state: string; completed_at: string | null }>("select state, completed_at from job where id = $1", [jobId]);
    expect(due!.state).toBe("balance_due");
    expect(due!.completed_at).not.toBeNull();
    const mail = await waitForMail(DEMO.customer.email, `balance due (${jobNo(number)})`, { after: started - 1000 });
    expect(mail.text).toContain(`$${((totalMinor - depositMinor) / 100).toFixed(2)}`);

    // The balance is paid (the processor's webhook), then the set goes back.
    await sql("update job set state = 'paid_in_full' where id = $1", [jobId]);
    const noTracking = await tech.post(`/api/bench/jobs/${jobId}/return`, {
      method: "shipped",
      carrier: "Port Alder Parcel",
      trackingNumber: "",
    });
    expect(noTracking.status).toBe(400);
    expect(((await noTracking.json()) as { error: { fields: Record<string, string> } }).error.fields.trackingNumber).toBeTruthy();
    const ret = await tech.post(`/api/bench/jobs/${jobId}/return`, {
      method: "shipped",
      carrier: "Port Alder Parcel",
      trackingNumber: "PAP 4471 0092",
    });
    expect(ret.status).toBe(200);
    const [returned] = await sql<{
      state: string;
      return_method: string;
      carrier: string;
      tracking_number: string;
      returned_at: string | null;
    }>("select state, return_method, carrier, tracking_number, returned_at from job where id = $1", [jobId]);
    expect(returned).toMatchObject({
      state: "returned",
      return_method: "shipped",
      carrier: "Port Alder Parcel",
      tracking_number: "PAP 4471 0092",
    });
    const certs = await sql("select id from certificate where job_id = $1", [jobId]);
    expect(certs).toHaveLength(1);
    await waitForMail(DEMO.customer.email, new RegExp(jobNo(number)), { after: started - 1000 });

    // Every state change wrote exactly one audit row, matching its history row.
    const { history, audits } = await historyAndAudit(jobId);
    const moves = (rows: { from: string; to: string }[]) => rows.map((r) => `${r.from}>${r.to}`).sort();
    expect(history.length).toBe(audits.length);
    expect(moves(audits.map((a) => ({ from: a.before.state, to: a.after.state })))).toEqual(
      moves(history.map((h) => ({ from: h.from_state, to: h.to_state }))),
    );
    expect(history.map((h) => h.to_state)).toEqual(
      expect.arrayContaining(["estimate_sent", "on_bench", "final_checks", "balance_due", "returned"]),
    );
  });

  it("requires the leakage test on a mains set even when the estimate leaves it out", async () => {
    const { jobId } = await createJob({ state: "in_triage", technicianEmail: DEMO.tech.email });
    const v = (await (await tech.get(`/api/bench/jobs/${jobId}/estimate`)).json()) as { lines: { code: string }[] };
    const withoutLeakage = v.lines.filter((l) => l.code !== "test.leakage");
    expect(
      (await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: withoutLeakage } })).status,
    ).toBe(200);
    expect((await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version: 1 })).status).toBe(200);
    await approveAndPayDeposit(jobId);
    expect((await tech.post(`/api/bench/jobs/${jobId}/start-bench`)).status).toBe(200);
    const s = await sheet(jobId);
    expect(s.requirements.map((r) => r.key)).toEqual(expect.arrayContaining(["leakage.plug-a", "leakage.plug-b"]));
    expect(s.reasons.filter((r) => r.key.startsWith("leakage."))).toHaveLength(2);
  });

  it("asks no leakage reading of a battery set", async () => {
    const { jobId } = await createJob({
      maker: "Corvane",
      profile: CORVANE_PROFILE as unknown as Record<string, unknown>,
      state: "on_bench",
    });
    const s = await sheet(jobId);
    expect(s.requirements.some((r) => r.key.startsWith("leakage."))).toBe(false);
    expect(s.requirements.some((r) => r.key === "bplus")).toBe(false);
  });
});
