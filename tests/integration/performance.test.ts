import { evaluate } from "mathjs";
import { PDFParse } from "pdf-parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { CertificateDocument } from "@/lib/engine/certificates/document";
import { verifyStoredCertificate } from "@/lib/server/services/certificates";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import type { TestClient } from "../support/http";
import { AURELIAN_PROFILE, createJob } from "./bench-fixtures";
import { createCertificate, stopQueue } from "./certificates-fixtures";

type Bad = { error: { code: string; message: string; fields: Record<string, string> } };
type Sheet = {
  reasons: { key: string }[];
  performance: {
    enabled: boolean;
    requirements: { key: string; verdict: string; toleranceText: string; value: number | null }[];
    sweeps: { ifKHz: number; curve: string; result: { db3: { widthKHz: number | null }; db6: { widthKHz: number | null } } }[];
  };
};

// The textbook single-tuned response |H| = 1/sqrt(1 + (2Q·Δf/f0)²), whose −3 dB bandwidth is f0/Q (from memory
// of any radio-engineering text), evaluated by mathjs: f0 = 455 kHz, Q = 50 → 9.1 kHz.
const SWEEP = Array.from({ length: 41 }, (_, i) => {
  const df = -20 + i;
  return { offsetKHz: df, db: Number((evaluate("20 * log10(1 / sqrt(1 + (2 * 50 * df / 455)^2))", { df }) as number).toFixed(3)) };
});

let tech: TestClient;
let owner: TestClient;
let jobId: string;

async function pdfText(res: Response): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, " ");
  } finally {
    await parser.destroy();
  }
}

const sheet = async () => (await (await tech.get(`/api/bench/jobs/${jobId}/sheet`)).json()) as Sheet;
const put = (body: unknown) => tech.request(`/api/bench/jobs/${jobId}/performance`, { method: "PUT", json: body });
const record = (key: string, value: number) => tech.post(`/api/bench/jobs/${jobId}/readings`, { key, value });

beforeAll(async () => {
  [tech, owner] = await Promise.all([signedIn(DEMO.tech), signedIn(DEMO.owner)]);
  ({ jobId } = await createJob({ profile: { ...AURELIAN_PROFILE }, state: "on_bench", technicianEmail: DEMO.tech.email }));
});
afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

describe("performance readings and the IF passband on a job", () => {
  it("offers nothing until the technician opts in", async () => {
    expect((await sheet()).performance).toMatchObject({ enabled: false, requirements: [] });
    const refused = await record("perf.snr", 30);
    expect(refused.status).toBe(400);
    expect(((await refused.json()) as Bad).error.fields.key).toMatch(/does not call for that reading/);
    const sweep = await tech.post(`/api/bench/jobs/${jobId}/passband`, {
      curve: "response",
      ifKHz: 455,
      method: "generator",
      points: SWEEP,
    });
    expect(sweep.status).toBe(409);
  });

  it("records without a figure and judges with one, in the right direction", async () => {
    expect((await put({ enabled: true })).status).toBe(200);
    const offered = (await sheet()).performance.requirements.map((r) => r.key);
    // A five-tube AC/DC set: three sensitivity points, the audio figures and five tubes (no transistor checks).
    expect(offered).toContain("perf.band.0.sens.mid");
    expect(offered).toContain("perf.tube.5");
    expect(offered).not.toContain("perf.idle-current");

    const snr = await record("perf.snr", 32);
    expect(snr.status).toBe(200);
    expect(await snr.json()).toMatchObject({ verdict: "recorded", toleranceText: "recorded, no service figure entered" });

    expect((await put({ enabled: true, figures: { "perf.band.0.sens.mid": 20, "perf.tube.1": 60 } })).status).toBe(200);
    // Sensitivity is the input needed for the reference output: 12 µV against a 20 µV figure is better.
    expect(await (await record("perf.band.0.sens.mid", 12)).json()).toMatchObject({
      verdict: "pass",
      toleranceText: "at most 20 µV (the set's service figure)",
    });
    // A tube reading below the tester's minimum fails.
    expect(await (await record("perf.tube.1", 45)).json()).toMatchObject({
      verdict: "fail",
      toleranceText: "at least 60 scale (the tester's minimum)",
    });

    // Optional readings never hold up completion, failing or missing.
    expect((await sheet()).reasons.filter((r) => r.key.startsWith("perf."))).toEqual([]);
  });

  it("names the field and what is allowed for bad figures and values", async () => {
    const unknown = await put({ enabled: true, figures: { "perf.band.4.sens.low": 10 } });
    expect(unknown.status).toBe(400);
    expect(((await unknown.json()) as Bad).error.fields["figures.perf.band.4.sens.low"]).toMatch(/does not offer/);
    const zero = await record("perf.band.0.sens.low", 0);
    expect(zero.status).toBe(400);
    expect(((await zero.json()) as Bad).error.fields.value).toMatch(/above zero µV/);
    const badCond = await put({ enabled: true, conditions: { referenceOutputMW: -5 } });
    expect(badCond.status).toBe(400);
  });

  it("reads the passband from a sweep: −3 dB width f0/Q = 9.1 kHz (textbook single tuned)", async () => {
    const res = await tech.post(`/api/bench/jobs/${jobId}/passband`, { curve: "response", ifKHz: 455, method: "generator", points: SWEEP });
    expect(res.status).toBe(200);
    const s = (await sheet()).performance.sweeps;
    expect(s).toHaveLength(1);
    expect(s[0]!.result.db3.widthKHz!).toBeCloseTo(9.1, 1);
    const wrongIf = await tech.post(`/api/bench/jobs/${jobId}/passband`, { curve: "response", ifKHz: 262, method: "sweep", points: SWEEP });
    expect(wrongIf.status).toBe(400);
    expect(((await wrongIf.json()) as Bad).error.message).toMatch(/no IF of 262 kHz/);
    const fmOnAm = await tech.post(`/api/bench/jobs/${jobId}/passband`, {
      curve: "discriminator",
      ifKHz: 455,
      method: "sweep",
      points: SWEEP.map((p) => ({ offsetKHz: p.offsetKHz, volts: p.offsetKHz / 10 })),
    });
    expect(fmOnAm.status).toBe(400);
  });

  it("prints both sections on the signed certificate when the set goes back, and older certificates still verify", async () => {
    await sql("update job set state = 'paid_in_full', completed_at = now() where id = $1", [jobId]);
    const ret = await tech.post(`/api/bench/jobs/${jobId}/return`, { method: "pick-up" });
    expect(ret.status).toBe(200);
    const [row] = await sql<{ id: string; content: CertificateDocument; signature: string; keyId: string }>(
      `select id, content, signature, key_id as "keyId" from certificate where job_id = $1`,
      [jobId],
    );
    expect(verifyStoredCertificate(row!)).toBe(true);
    expect(row!.content.performance!.readings.map((r) => [r.key, r.verdict])).toEqual([
      ["perf.band.0.sens.mid", "pass"],
      ["perf.snr", "recorded"],
      ["perf.tube.1", "fail"],
    ]);
    expect(row!.content.passband![0]).toMatchObject({ curve: "response", ifKHz: 455 });
    // Performance readings are not repeated among the alignment readings.
    expect(row!.content.readings.some((r) => r.key.startsWith("perf."))).toBe(false);

    const pdf = await owner.get(`/api/certificates/${row!.id}/pdf`);
    expect(pdf.status).toBe(200);
    const text = await pdfText(pdf);
    expect(text).toMatch(/RECEIVER PERFORMANCE/i);
    expect(text).toMatch(/sensitivity at 1 ?000 kHz|sensitivity at \d+ kHz/i);
    expect(text).toMatch(/Recorded/);
    // The certificate font has no Greek: the load is spelt "ohms"; µ comes back from the PDF as Greek mu.
    expect(text).toMatch(/50 mW into 8 ohms/);
    expect(text).not.toMatch(/[Ω©]/);
    expect(text).toMatch(/at most 20 [µμ]V \(the set's service figure\)/);
    expect(text).toMatch(/IF PASSBAND/i);
    // Points 1 kHz apart: the interpolated width lands within 0.05 kHz of f0/Q = 9.1 kHz.
    expect(Number(/−3 dB bandwidth ([\d.]+) kHz/.exec(text)![1])).toBeCloseTo(9.1, 1);

    // A certificate issued without the sections (every certificate before them): no sections, still verifies.
    const plain = await createCertificate();
    const [old] = await sql<{ id: string; content: CertificateDocument; signature: string; keyId: string }>(
      `select id, content, signature, key_id as "keyId" from certificate where id = $1`,
      [plain.certificateId],
    );
    expect("performance" in old!.content).toBe(false);
    expect("passband" in old!.content).toBe(false);
    expect(verifyStoredCertificate(old!)).toBe(true);
    const oldPdf = await pdfText(await owner.get(`/api/certificates/${old!.id}/pdf`));
    expect(oldPdf).not.toMatch(/RECEIVER PERFORMANCE/i);
  });
});
