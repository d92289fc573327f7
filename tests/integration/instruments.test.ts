import { randomUUID } from "node:crypto";
import { PDFParse } from "pdf-parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { CertificateDocument } from "@/lib/engine/certificates/document";
import { verifyStoredCertificate } from "@/lib/server/services/certificates";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { AURELIAN_PROFILE, createJob } from "./bench-fixtures";
import { createCertificate, createReturnedJob, issueFor, stopQueue } from "./certificates-fixtures";

// The instrument register, the instrument and phase of each reading, and what the certificate prints of them.

let owner: TestClient;
let tech: TestClient;
beforeAll(async () => {
  owner = await signedIn(DEMO.owner);
  tech = await signedIn(DEMO.tech);
});
afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

const day = (offset: number) => new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10);

type Instrument = { id: string; kind: string; retiredAt: string | null; overdue: boolean; readingsTaken: number; calibrationDueOn: string };

async function addInstrument(fields: Partial<Record<string, string>> = {}): Promise<Instrument> {
  const res = await owner.post("/api/office/instruments", {
    kind: "meter",
    maker: "Port Alder Instruments",
    model: "KM-T",
    serial: `T-${randomUUID().slice(0, 8)}`,
    calibratedOn: day(-100),
    calibrationDueOn: day(265),
    ...fields,
  });
  expect(res.status, await res.clone().text()).toBe(200);
  return ((await res.json()) as { instrument: Instrument }).instrument;
}

async function pdfText(res: Response): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, " ");
  } finally {
    await parser.destroy();
  }
}

type Sheet = {
  defaultPhase: string;
  instruments: { id: string }[];
  lastChoices: Record<string, string>;
  reasons: { key: string; kind: string }[];
  requirements: {
    key: string;
    verdict: string;
    value: number | null;
    instrumentId: string | null;
    instrumentOverdue: boolean;
    asReceived: { value: number; verdict: string; instrumentOverdue: boolean } | null;
  }[];
};
const sheetOf = async (jobId: string) => (await (await tech.get(`/api/bench/jobs/${jobId}/sheet`)).json()) as Sheet;

describe("the instrument register, kept by the owner", () => {
  it("adds an instrument, refuses a duplicate and bad fields by name, and hides the register from the bench", async () => {
    const serial = `PAI-${randomUUID().slice(0, 6)}`;
    const sg = await addInstrument({ kind: "signal_generator", model: "SG-40", serial });
    expect(sg).toMatchObject({ kind: "signal_generator", retiredAt: null, overdue: false, readingsTaken: 0 });
    const [row] = await sql<{ maker: string; calibration_due_on: string }>(
      "select maker, to_char(calibration_due_on, 'YYYY-MM-DD') as calibration_due_on from instrument where id = $1",
      [sg.id],
    );
    expect(row).toEqual({ maker: "Port Alder Instruments", calibration_due_on: day(265) });
    const [audit] = await sql("select action from audit_event where entity = 'instrument' and entity_id = $1", [sg.id]);
    expect(audit).toEqual({ action: "instrument.add" });

    // The same instrument written with other capitals is the same instrument.
    const dup = await owner.post("/api/office/instruments", {
      kind: "signal_generator",
      maker: "port alder instruments",
      model: "sg-40",
      serial: serial.toLowerCase(),
      calibratedOn: day(-1),
      calibrationDueOn: day(300),
    });
    expect(dup.status).toBe(409);
    expect(((await dup.json()) as { error: { fields: Record<string, string> } }).error.fields.serial).toMatch(/already holds/);

    const bad = await owner.post("/api/office/instruments", {
      kind: "voltmeter",
      maker: "",
      model: "X",
      serial: "1",
      calibratedOn: "2026-02-30",
      calibrationDueOn: day(0),
    });
    expect(bad.status).toBe(400);
    const fields = ((await bad.json()) as { error: { fields: Record<string, string> } }).error.fields;
    expect(fields.kind).toMatch(/Kind: choose one of signal generator/);
    expect(fields.maker).toMatch(/^Maker/);
    expect(fields.calibratedOn).toMatch(/^Last calibration/);

    // Shop settings are the owner's: a technician is told the route does not exist.
    expect((await tech.post("/api/office/instruments", { kind: "meter" })).status).toBe(404);
    expect((await tech.get("/api/office/instruments")).status).toBe(404);
    const list = (await (await owner.get("/api/office/instruments")).json()) as { instruments: Instrument[] };
    expect(list.instruments.some((i) => i.id === sg.id)).toBe(true);
  });

  it("retires an instrument (kept, no longer offered), deletes one never used, and refuses to delete one that was", async () => {
    const job = await createJob({ state: "on_bench", profile: { ...AURELIAN_PROFILE }, technicianEmail: DEMO.tech.email });
    const used = await addInstrument({ kind: "leakage_tester", model: "LT-R" });
    const spare = await addInstrument({ kind: "leakage_tester", model: "LT-S" });
    const rec = await tech.post(`/api/bench/jobs/${job.jobId}/readings`, { key: "leakage.plug-a", value: 0.12, instrumentId: used.id });
    expect(rec.status).toBe(200);

    const retire = await owner.request(`/api/office/instruments/${used.id}`, { method: "PATCH", json: { retired: true } });
    expect(retire.status).toBe(200);
    expect(((await retire.json()) as { instrument: Instrument }).instrument).toMatchObject({ readingsTaken: 1 });
    const [r] = await sql<{ retired: boolean }>("select retired_at is not null as retired from instrument where id = $1", [used.id]);
    expect(r!.retired).toBe(true);
    // Not offered at the bench any more, and a new reading naming it is refused on its field.
    const sheet = await sheetOf(job.jobId);
    expect(sheet.instruments.map((i) => i.id)).not.toContain(used.id);
    expect(sheet.instruments.map((i) => i.id)).toContain(spare.id);
    const again = await tech.post(`/api/bench/jobs/${job.jobId}/readings`, { key: "leakage.plug-b", value: 0.1, instrumentId: used.id });
    expect(again.status).toBe(400);
    expect(((await again.json()) as { error: { fields: Record<string, string> } }).error.fields.instrumentId).toMatch(/retired/);
    // The reading taken with it keeps naming it.
    const [kept] = await sql<{ instrument_id: string }>("select instrument_id from reading where job_id = $1 and key = 'leakage.plug-a'", [
      job.jobId,
    ]);
    expect(kept!.instrument_id).toBe(used.id);

    const refused = await owner.request(`/api/office/instruments/${used.id}`, { method: "DELETE" });
    expect(refused.status).toBe(409);
    expect(await sql("select id from instrument where id = $1", [used.id])).toHaveLength(1);
    const gone = await owner.request(`/api/office/instruments/${spare.id}`, { method: "DELETE" });
    expect(gone.status).toBe(200);
    expect(await sql("select id from instrument where id = $1", [spare.id])).toHaveLength(0);

    const back = await owner.request(`/api/office/instruments/${used.id}`, { method: "PATCH", json: { retired: false } });
    expect(((await back.json()) as { instrument: Instrument }).instrument.retiredAt).toBeNull();
    expect((await owner.request(`/api/office/instruments/${randomUUID()}`, { method: "PATCH", json: { retired: true } })).status).toBe(404);
  });
});

describe("readings and their instruments", () => {
  it("flags a reading taken after the instrument's calibration due date, and not one taken on it", async () => {
    const job = await createJob({ state: "on_bench", profile: { ...AURELIAN_PROFILE }, technicianEmail: DEMO.tech.email });
    // Common practice: an instrument is in calibration through the due date on its label, overdue from the next day.
    const lapsed = await addInstrument({ kind: "meter", model: "KM-L", calibratedOn: day(-400), calibrationDueOn: day(-1) });
    const dueToday = await addInstrument({ kind: "meter", model: "KM-D", calibratedOn: day(-365), calibrationDueOn: day(0) });
    expect(lapsed.overdue).toBe(true);

    const a = await tech.post(`/api/bench/jobs/${job.jobId}/readings`, { key: "leakage.plug-a", value: 0.12, instrumentId: lapsed.id });
    expect(a.status).toBe(200);
    expect(await a.json()).toMatchObject({ instrumentOverdue: true, instrumentId: lapsed.id, phase: "as_returned" });
    const b = await tech.post(`/api/bench/jobs/${job.jobId}/readings`, { key: "leakage.plug-b", value: 0.12, instrumentId: dueToday.id });
    expect(await b.json()).toMatchObject({ instrumentOverdue: false });
    const rows = await sql<{ key: string; instrument_overdue: boolean }>(
      "select key, instrument_overdue from reading where job_id = $1 order by key",
      [job.jobId],
    );
    expect(rows).toEqual([
      { key: "leakage.plug-a", instrument_overdue: true },
      { key: "leakage.plug-b", instrument_overdue: false },
    ]);
    const sheet = await sheetOf(job.jobId);
    expect(sheet.requirements.find((r) => r.key === "leakage.plug-a")).toMatchObject({ instrumentOverdue: true, instrumentId: lapsed.id });
    // The technician's last meter is remembered for the next reading.
    expect(sheet.lastChoices.meter).toBe(dueToday.id);

    // A leakage reading is not taken with a signal generator.
    const sg = await addInstrument({ kind: "signal_generator", model: "SG-K" });
    const wrong = await tech.post(`/api/bench/jobs/${job.jobId}/readings`, { key: "leakage.plug-a", value: 0.12, instrumentId: sg.id });
    expect(wrong.status).toBe(400);
    expect(((await wrong.json()) as { error: { fields: Record<string, string> } }).error.fields.instrumentId).toMatch(
      /leakage tester or meter, not a signal generator/,
    );
  });

  it("keeps as received apart from as returned; the gate judges the set as it goes back", async () => {
    const job = await createJob({ state: "on_bench", profile: { ...AURELIAN_PROFILE }, technicianEmail: DEMO.tech.email });
    await sql("insert into job_task (job_id, code, title) values ($1, 'test.leakage', 'Leakage test')", [job.jobId]);
    // Nothing ticked yet on a set just in: the sheet proposes as received.
    expect((await sheetOf(job.jobId)).defaultPhase).toBe("as_received");
    // 0.8 mA is over the 0.5 mA limit (REFERENCES: the shop's leakage limit), as it came in.
    const inbound = await tech.post(`/api/bench/jobs/${job.jobId}/readings`, { key: "leakage.plug-a", value: 0.8, phase: "as_received" });
    expect(await inbound.json()).toMatchObject({ phase: "as_received", verdict: "fail" });
    let sheet = await sheetOf(job.jobId);
    const before = sheet.requirements.find((r) => r.key === "leakage.plug-a")!;
    expect(before).toMatchObject({ value: null, verdict: "missing", asReceived: { value: 0.8, verdict: "fail" } });
    expect(sheet.reasons.find((r) => r.key === "leakage.plug-a")?.kind).toBe("reading-missing");

    await tech.post(`/api/bench/jobs/${job.jobId}/readings`, { key: "leakage.plug-a", value: 0.12, phase: "as_returned" });
    expect((await tech.post(`/api/bench/jobs/${job.jobId}/tasks`, { code: "test.leakage", done: true })).status).toBe(200);
    sheet = await sheetOf(job.jobId);
    expect(sheet.requirements.find((r) => r.key === "leakage.plug-a")).toMatchObject({
      value: 0.12,
      verdict: "pass",
      asReceived: { value: 0.8, verdict: "fail" },
    });
    expect(sheet.reasons.some((r) => r.key === "leakage.plug-a")).toBe(false);
    expect(sheet.defaultPhase).toBe("as_returned");
    const rows = await sql<{ phase: string; value: number }>(
      "select phase, value from reading where job_id = $1 and key = 'leakage.plug-a' order by phase",
      [job.jobId],
    );
    expect(rows).toEqual([
      { phase: "as_received", value: 0.8 },
      { phase: "as_returned", value: 0.12 },
    ]);
    const bad = await tech.post(`/api/bench/jobs/${job.jobId}/readings`, { key: "leakage.plug-a", value: 0.1, phase: "at_intake" });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { fields: Record<string, string> } }).error.fields.phase).toMatch(/as received or as returned/);
  });
});

describe("the certificate", () => {
  it("lists the instruments used with their due dates and prints the readings as received and as returned", async () => {
    // The demo's returned job went through the bench with both phases and the demo instruments.
    const [cert] = await sql<{ id: string; content: CertificateDocument; job_id: string }>(
      "select c.id, c.content, c.job_id from certificate c join job j on j.id = c.job_id where j.idempotency_key = 'demo-returned' and c.superseded_by_id is null",
    );
    const d = cert!.content;
    const stored = await sql<{ key: string; phase: string; value: number }>("select key, phase, value from reading where job_id = $1", [
      cert!.job_id,
    ]);
    const edgeLow = d.readings.find((r) => r.key === "band.0.edge.low")!;
    // The band edges come from the as-returned readings; the as-received figure rides beside them.
    expect(edgeLow.value).toBe(stored.find((r) => r.key === "band.0.edge.low" && r.phase === "as_returned")!.value);
    expect(edgeLow.asReceived?.value).toBe(stored.find((r) => r.key === "band.0.edge.low" && r.phase === "as_received")!.value);
    expect(d.instruments?.map((i) => `${i.maker} ${i.model}`)).toEqual(
      expect.arrayContaining(["Port Alder Instruments SG-40", "Tillwater Electric LT-2"]),
    );

    const res = await (await signedIn(DEMO.customer)).get(`/api/certificates/${cert!.id}/pdf`);
    expect(res.status).toBe(200);
    const text = await pdfText(res);
    expect(text).toMatch(/instruments used/i);
    const [sg] = await sql<{ due: string }>(
      "select to_char(calibration_due_on, 'YYYY-MM-DD') as due from instrument where maker = 'Port Alder Instruments' and model = 'SG-40'",
    );
    expect(text).toContain("Port Alder Instruments SG-40");
    expect(text).toContain(sg!.due);
    expect(text).toContain("As received");
    expect(text).toContain("As returned");
  });

  it("flags on the certificate a reading taken with an overdue instrument", async () => {
    const job = await createReturnedJob();
    const lapsed = await addInstrument({ kind: "leakage_tester", model: "LT-O", calibratedOn: day(-500), calibrationDueOn: day(-30) });
    await sql("update reading set instrument_id = $2, instrument_overdue = true where job_id = $1 and key = 'leakage.plug-a'", [
      job.jobId,
      lapsed.id,
    ]);
    const { certificateId } = await issueFor(job.jobId);
    const [row] = await sql<{ content: CertificateDocument }>("select content from certificate where id = $1", [certificateId]);
    expect(row!.content.readings.find((r) => r.key === "leakage.plug-a")).toMatchObject({ instrument: "I1", instrumentOverdue: true });
    const text = await pdfText(await owner.get(`/api/certificates/${certificateId}/pdf`));
    expect(text).toContain("I1 (calibration overdue)");
    expect(text).toContain(`${day(-30)} — overdue for 1 reading`);
    // No as-received reading on this job: the readings table keeps its single Measured column.
    expect(text).not.toContain("As received");
  });

  it("leaves a certificate issued before the register exactly as signed: it still verifies and renders", async () => {
    // A certificate of a job with no instrument named and no as-received reading carries none of the new
    // fields: the same content a certificate issued before the register carries.
    const c = await createCertificate();
    const [row] = await sql<{ content: Record<string, unknown>; signature: string; keyId: string; code: string }>(
      `select content, signature, key_id as "keyId", code from certificate where id = $1`,
      [c.certificateId],
    );
    expect(Object.keys(row!.content)).not.toContain("instruments");
    expect(JSON.stringify(row!.content)).not.toMatch(/asReceived|instrument/);
    // Later bench data on the same job (an as-received reading, an instrument) leaves the signed row alone.
    const meter = await addInstrument({ kind: "leakage_tester", model: "LT-P" });
    await sql(
      "insert into reading (job_id, key, value, unit, verdict, phase, instrument_id) values ($1, 'leakage.plug-a', 0.7, 'mA', 'fail', 'as_received', $2)",
      [c.jobId, meter.id],
    );
    const [after] = await sql<{ content: Record<string, unknown>; signature: string; keyId: string }>(
      `select content, signature, key_id as "keyId" from certificate where id = $1`,
      [c.certificateId],
    );
    expect(after!.content).toEqual(row!.content);
    expect(verifyStoredCertificate(after!)).toBe(true);
    const page = await new TestClient().get(`/verify/${row!.code}`);
    expect(page.status).toBe(200);
    expect(await page.text()).not.toMatch(/cannot be verified/i);
    const pdf = await owner.get(`/api/certificates/${c.certificateId}/pdf`);
    expect(pdf.status).toBe(200);
    const text = await pdfText(pdf);
    expect(text).not.toMatch(/instruments used/i);
    // Tampering is still caught: the check is real.
    expect(verifyStoredCertificate({ ...after!, content: { ...after!.content, instruments: [] } })).toBe(false);
  });
});
