import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { waitForMail } from "../support/mail";
import { createJob } from "./bench-fixtures";

type DraftLine = {
  key: string;
  kind: "labour" | "part";
  code: string;
  title: string;
  minutes: number;
  quantity: number;
  unitCost: string;
  markupPercent: string;
  covered: boolean;
  reason: string;
  readings: string[];
  category: string;
};
type EstimateView = {
  version: number;
  saved: boolean;
  lines: DraftLine[];
  priced: { totals: { totalMinor: number; depositMinor: number; labourMinor: number; partsMinor: number; taxMinor: number } } | null;
  revisions: { revision: number; status: string }[];
};

let tech: TestClient;
let tech2: TestClient;

beforeAll(async () => {
  tech = await signedIn(DEMO.tech);
  tech2 = await signedIn(DEMO.tech2);
});
afterAll(async () => {
  await closeTestPool();
});

async function view(client: TestClient, jobId: string): Promise<EstimateView> {
  const res = await client.get(`/api/bench/jobs/${jobId}/estimate`);
  expect(res.status).toBe(200);
  return (await res.json()) as EstimateView;
}

async function storedDraft(jobId: string): Promise<{ version: number; lines: DraftLine[] }> {
  const [row] = await sql<{ version: number; draft: { lines: DraftLine[] } }>("select version, draft from estimate where job_id = $1", [
    jobId,
  ]);
  return { version: row!.version, lines: row!.draft.lines };
}

describe("estimate drafts and optimistic concurrency", () => {
  it("builds the first draft from the checklist, priced as the engine prices the profile", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const v = await view(tech, jobId);
    expect(v.saved).toBe(false);
    expect(v.version).toBe(0);
    const codes = v.lines.map((l) => l.code);
    expect(codes).toContain("safety.isolation-bench");
    expect(codes).toContain("test.leakage");
    expect(codes).toContain("part.cap.y2");
    expect(v.lines.find((l) => l.code === "safety.y-capacitor")!.reason).toMatch(/Y-class/);
    // Unedited, the draft is priced exactly like the engine's own estimate of the profile.
    const [{ profile }] = (await sql<{ profile: Record<string, unknown> }>(
      "select s.profile from radio_set s join job j on j.set_id = s.id where j.id = $1",
      [jobId],
    )) as [{ profile: Record<string, unknown> }];
    const tool = await tech.post("/api/tools/estimate", { profile });
    expect(tool.status).toBe(200);
    const engine = (await tool.json()) as {
      totals: { totalMinor: number; depositMinor: number; labourMinor: number; partsMinor: number; taxMinor: number };
    };
    expect(v.priced!.totals.totalMinor).toBe(engine.totals.totalMinor);
    expect(v.priced!.totals.depositMinor).toBe(engine.totals.depositMinor);
    expect(v.priced!.totals.labourMinor).toBe(engine.totals.labourMinor);
    expect(v.priced!.totals.partsMinor).toBe(engine.totals.partsMinor);
  });

  it("answers one 200 and one 409 to two saves of the same version, and loses nothing", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const v = await view(tech, jobId);
    const first = await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: v.lines } });
    expect(first.status).toBe(200);
    expect(((await first.json()) as { version: number }).version).toBe(1);

    // Two people edit version 1 at once: one removes the burn-in, the other raises the intake minutes.
    const mine = v.lines.filter((l) => l.code !== "test.burn-in");
    const theirs = v.lines.map((l) => (l.code === "inspect.intake" ? { ...l, minutes: 45 } : l));
    const [a, b] = await Promise.all([
      tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 1, lines: mine } }),
      tech2.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 1, lines: theirs } }),
    ]);
    const statuses = [a.status, b.status].sort();
    expect(statuses).toEqual([200, 409]);
    const loser = a.status === 409 ? a : b;
    const loserLines = a.status === 409 ? mine : theirs;
    const winnerLines = a.status === 409 ? theirs : mine;
    const body = (await loser.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe("stale");
    expect(body.error.message).toMatch(/someone else saved/i);
    expect(body.error.message).toMatch(/version 2/);

    // The winner's save stands untouched by the stale one.
    const afterRace = await storedDraft(jobId);
    expect(afterRace.version).toBe(2);
    expect(afterRace.lines.map((l) => [l.code, l.minutes])).toEqual(winnerLines.map((l) => [l.code, l.minutes]));

    // The loser still has their edits and can save them over the new version.
    const retry = await (a.status === 409 ? tech : tech2).request(`/api/bench/jobs/${jobId}/estimate`, {
      method: "PUT",
      json: { version: 2, lines: loserLines },
    });
    expect(retry.status).toBe(200);
    const final = await storedDraft(jobId);
    expect(final.version).toBe(3);
    expect(final.lines.map((l) => [l.code, l.minutes])).toEqual(loserLines.map((l) => [l.code, l.minutes]));
  });

  it("refuses one of two first saves of a never-saved estimate", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const v = await view(tech, jobId);
    const [a, b] = await Promise.all([
      tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: v.lines } }),
      tech2.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: v.lines.slice(1) } }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const rows = await sql("select id from estimate where job_id = $1", [jobId]);
    expect(rows).toHaveLength(1);
  });

  it("rejects bad lines with field messages and keeps the stored draft", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const v = await view(tech, jobId);
    await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: v.lines } });
    const bad = v.lines.map((l, i) => (i === 0 ? { ...l, minutes: -5 } : l.kind === "part" ? { ...l, unitCost: "4.5.0" } : l));
    const res = await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 1, lines: bad } });
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(body.error.fields["lines.0.minutes"]).toMatch(/Minutes/);
    expect(Object.keys(body.error.fields).some((k) => k.endsWith(".unitCost"))).toBe(true);
    expect((await storedDraft(jobId)).version).toBe(1);
  });

  it("keeps customers and visitors out", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const customer = await signedIn(DEMO.customer);
    expect((await customer.get(`/api/bench/jobs/${jobId}/estimate`)).status).toBe(404);
    expect((await customer.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: [] } })).status).toBe(
      404,
    );
    expect((await new TestClient().get(`/api/bench/jobs/${jobId}/estimate`)).status).toBe(401);
  });
});

describe("sending revisions", () => {
  it("sends revision 1, then a revised revision 2 that supersedes it and needs a change summary", async () => {
    const { jobId, number } = await createJob({ state: "in_triage" });
    const v = await view(tech, jobId);
    const saved = await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: v.lines } });
    expect(saved.status).toBe(200);
    const started = Date.now();
    const send1 = await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version: 1 });
    expect(send1.status).toBe(200);
    expect(((await send1.json()) as { revision: number }).revision).toBe(1);

    const [job] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    expect(job!.state).toBe("estimate_sent");
    const [rev1] = await sql<{
      id: string;
      status: string;
      total_minor: number;
      deposit_minor: number;
      labour_minor: number;
      parts_minor: number;
      tax_minor: number;
      rounding_minor: number;
    }>(
      "select id, status, total_minor, deposit_minor, labour_minor, parts_minor, tax_minor, (pricing->>'roundingLabourMinor')::int as rounding_minor from estimate_revision where job_id = $1 and revision = 1",
      [jobId],
    );
    expect(rev1!.status).toBe("sent");
    expect(rev1!.total_minor).toBe(v.priced!.totals.totalMinor);
    expect(rev1!.deposit_minor).toBe(v.priced!.totals.depositMinor);
    expect(rev1!.labour_minor + rev1!.parts_minor + rev1!.tax_minor).toBe(rev1!.total_minor);
    const lines = await sql<{ code: string; position: number; labour_minor: number; parts_minor: number }>(
      "select code, position, labour_minor, parts_minor from estimate_line where revision_id = $1 order by position",
      [rev1!.id],
    );
    expect(lines.map((l) => l.code)).toEqual(v.lines.map((l) => l.code));
    // Labour is rounded to the billing increment once per job: the lines plus that rounding make the labour.
    expect(rev1!.rounding_minor).toBeGreaterThanOrEqual(0);
    expect(lines.reduce((s, l) => s + l.labour_minor, 0) + rev1!.rounding_minor).toBe(rev1!.labour_minor);
    expect(lines.reduce((s, l) => s + l.parts_minor, 0)).toBe(rev1!.parts_minor);
    // The labour lines become the checklist to tick at the bench.
    const tasks = await sql<{ code: string }>("select code from job_task where job_id = $1", [jobId]);
    expect(tasks.map((t) => t.code).sort()).toEqual(
      v.lines
        .filter((l) => l.kind === "labour")
        .map((l) => l.code)
        .sort(),
    );

    const jobNo = `KL-${String(number).padStart(4, "0")}`;
    const mail1 = await waitForMail(DEMO.customer.email, new RegExp(`estimate for .* is ready \\(${jobNo}\\)`), { after: started - 1000 });
    expect(mail1.text).toContain(`/portal/jobs/${jobId}`);

    // A change after sending: a new revision, with a summary, that the owner approves again.
    const edited = v.lines.filter((l) => l.code !== "mech.clean-controls");
    const save2 = await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 1, lines: edited } });
    expect(save2.status).toBe(200);
    const noSummary = await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version: 2 });
    expect(noSummary.status).toBe(400);
    expect(((await noSummary.json()) as { error: { fields: Record<string, string> } }).error.fields.changeSummary).toMatch(/what changed/i);
    const stale = await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, {
      version: 1,
      changeSummary: "Controls were cleaned by the owner.",
    });
    expect(stale.status).toBe(409);
    const send2 = await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, {
      version: 2,
      changeSummary: "Controls were already cleaned by the owner.",
    });
    expect(send2.status).toBe(200);
    const revs = await sql<{ revision: number; status: string; change_summary: string | null }>(
      "select revision, status, change_summary from estimate_revision where job_id = $1 order by revision",
      [jobId],
    );
    expect(revs).toEqual([
      { revision: 1, status: "superseded", change_summary: null },
      { revision: 2, status: "sent", change_summary: "Controls were already cleaned by the owner." },
    ]);
    const tasks2 = await sql<{ code: string }>("select code from job_task where job_id = $1", [jobId]);
    expect(tasks2.map((t) => t.code)).not.toContain("mech.clean-controls");
    const mail2 = await waitForMail(DEMO.customer.email, new RegExp(`Revised estimate .*\\(${jobNo}\\)`), { after: started - 1000 });
    expect(mail2.text).toContain("Controls were already cleaned by the owner.");
    const history = await sql<{ from_state: string; to_state: string }>(
      "select from_state, to_state from job_state_history where job_id = $1 order by at",
      [jobId],
    );
    expect(history.map((h) => `${h.from_state}>${h.to_state}`)).toEqual(["in_triage>estimate_sent", "estimate_sent>estimate_sent"]);
  });

  it("cannot send from a state that does not allow it", async () => {
    const { jobId } = await createJob({ state: "requested" });
    const v = await view(tech, jobId);
    await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines: v.lines } });
    const res = await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version: 1 });
    expect(res.status).toBe(409);
    expect((await sql("select id from estimate_revision where job_id = $1", [jobId])).length).toBe(0);
    const [job] = await sql<{ state: string }>("select state from job where id = $1", [jobId]);
    expect(job!.state).toBe("requested");
  });
});
