import { afterAll, describe, expect, it } from "vitest";
import { dayInZone } from "@/lib/engine/dates";
import type { StoredAdvice } from "@/lib/server/services/claims";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { waitForMail } from "../support/mail";
import { createCertificate, IDS, stopQueue } from "./certificates-fixtures";

afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

// Advice is for staff: the claimant's answer carries only the claim's id and status.
async function adviceOf(res: Response): Promise<StoredAdvice> {
  const body = (await res.json()) as { claim: { id: string; advice?: unknown } };
  expect(body.claim.advice).toBeUndefined();
  const [row] = await sql<{ advice: StoredAdvice }>("select advice from claim where id = $1", [body.claim.id]);
  return row!.advice;
}

const hum = { symptomCategory: "hum", description: "A loud hum after ten minutes of play, getting worse.", statements: [] as string[] };

describe("coverage advice on a new claim", () => {
  it("inside the term, on covered work: likely covered, with the linked work named", async () => {
    const c = await createCertificate();
    const owner = await signedIn(DEMO.customer);
    const res = await owner.post("/api/claims", { ...hum, certificateId: c.certificateId });
    expect(res.status).toBe(201);
    const advice = await adviceOf(res);
    expect(advice.outcome).toBe("likely-covered");
    expect(advice.insideTerm).toBe(true);
    expect(advice.matchedWork).toContain("recap.electrolytic");
    expect(advice.reasons.join(" ")).toMatch(/inside the term/);
    const [row] = await sql<{ status: string; claimant_id: string }>("select status, claimant_id from claim where certificate_id = $1", [
      c.certificateId,
    ]);
    expect(row).toEqual({ status: "open", claimant_id: IDS.mira });
  });

  it("a shock or tingle: stop using the set and inspect first, never likely covered, on the bench claims page too (common practice)", async () => {
    const c = await createCertificate();
    const owner = await signedIn(DEMO.customer);
    const res = await owner.post("/api/claims", {
      symptomCategory: "shock-or-tingle",
      description: "A tingle from the tuning knob when touching the aerial wire.",
      statements: [],
      certificateId: c.certificateId,
    });
    expect(res.status).toBe(201);
    const { claim } = (await res.clone().json()) as { claim: { id: string } };
    const advice = await adviceOf(res);
    expect(advice.outcome).toBe("inspect-first");
    expect(advice.reasons[0]).toMatch(/Stop using the set; inspect first/);
    const tech = await signedIn(DEMO.tech);
    const page = await (await tech.get(`/bench/claims/${claim.id}`)).text();
    expect(page).toContain("Stop using the set; inspect first");
    expect(page).toContain("Inspect first");
    expect(page).not.toContain("Likely covered");
  });

  it("one day after the term: not covered, outside the term", async () => {
    // A 90-day term counts from the day after the return: returned 91 days ago, it ended yesterday
    // (common legal convention for periods, from memory).
    const c = await createCertificate({ returnedDaysAgo: 91 });
    const [{ content }] = (await sql<{ content: { warranty: { endsOn: string } } }>("select content from certificate where id = $1", [
      c.certificateId,
    ])) as [{ content: { warranty: { endsOn: string } } }];
    // Days are the shop's calendar days, counted in its zone.
    const [{ time_zone }] = (await sql<{ time_zone: string }>("select time_zone from shop_settings where id = 'shop'")) as [
      { time_zone: string },
    ];
    expect(content.warranty.endsOn).toBe(dayInZone(Date.now() - 86_400_000, time_zone));
    const owner = await signedIn(DEMO.customer);
    const res = await owner.post("/api/claims", { ...hum, certificateId: c.certificateId });
    expect(res.status).toBe(201);
    const advice = await adviceOf(res);
    expect(advice.outcome).toBe("not-covered");
    expect(advice.insideTerm).toBe(false);
    expect(advice.reasons.join(" ")).toMatch(/outside the term/);
  });

  it("naming an exclusion: not covered, with the exclusion as the reason", async () => {
    const c = await createCertificate();
    const owner = await signedIn(DEMO.customer);
    const res = await owner.post("/api/claims", { ...hum, statements: ["excl.opened-by-others"], certificateId: c.certificateId });
    expect(res.status).toBe(201);
    const advice = await adviceOf(res);
    expect(advice.outcome).toBe("not-covered");
    expect(advice.insideTerm).toBe(true);
    expect(advice.reasons.join(" ")).toMatch(/Excluded: Faults after the set was opened/);
  });

  it("refuses bad input field by field and keeps nothing", async () => {
    const c = await createCertificate();
    const owner = await signedIn(DEMO.customer);
    const res = await owner.post("/api/claims", {
      certificateId: c.certificateId,
      symptomCategory: "exploded",
      description: "short",
      statements: ["excl.made-up"],
    });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(Object.keys(error.fields)).toEqual(expect.arrayContaining(["symptomCategory", "description"]));
    expect(await sql("select 1 from claim where certificate_id = $1", [c.certificateId])).toHaveLength(0);
  });
});

describe("one open claim per certificate", () => {
  it("20 concurrent submissions leave exactly one open claim; the rest get a clear 409", async () => {
    const c = await createCertificate();
    const owner = await signedIn(DEMO.customer);
    const results = await Promise.all(
      Array.from({ length: 20 }, () => owner.post("/api/claims", { ...hum, certificateId: c.certificateId })),
    );
    const statuses = results.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(19);
    const conflict = results.find((r) => r.status === 409)!;
    expect(((await conflict.json()) as { error: { message: string } }).error.message).toMatch(/already an open claim/);
    const open = await sql("select 1 from claim where certificate_id = $1 and status in ('open', 'inspecting')", [c.certificateId]);
    expect(open).toHaveLength(1);
  });
});

describe("another customer", () => {
  it("cannot see or claim against the certificate by id, only through the public page and the code the terms allow", async () => {
    const a = await createCertificate();
    const mira = await signedIn(DEMO.customer);
    const jonah = await signedIn(DEMO.customer2);
    expect((await jonah.get(`/api/certificates/${a.certificateId}/pdf`)).status).toBe(404);
    expect((await jonah.post("/api/claims", { ...hum, certificateId: a.certificateId })).status).toBe(404);
    expect((await jonah.get(`/portal/claims/new?certificate=${a.certificateId}`)).status).toBe(404);
    expect(await (await jonah.get("/portal/claims")).text()).not.toContain(a.code);
    expect((await jonah.get(`/verify/${a.code}`)).status).toBe(200);

    // Mira's claim stays hers.
    const mine = await mira.post("/api/claims", { ...hum, certificateId: a.certificateId });
    const { claim } = (await mine.json()) as { claim: { id: string } };
    expect((await jonah.get(`/portal/claims/${claim.id}`)).status).toBe(404);
    const listed = (await (await jonah.get("/api/claims")).json()) as { claims: { id: string }[] };
    expect(listed.claims.map((x) => x.id)).not.toContain(claim.id);

    // The code path: the default terms let coverage pass to a later owner.
    const b = await createCertificate();
    const byCode = await jonah.post("/api/claims/by-code", { ...hum, code: b.code.toLowerCase().replaceAll("-", " ") });
    expect(byCode.status).toBe(201);
    const [row] = await sql<{ claimant_id: string }>("select claimant_id from claim where certificate_id = $1", [b.certificateId]);
    expect(row!.claimant_id).toBe(IDS.jonah);
    const wrong = await jonah.post("/api/claims/by-code", { ...hum, code: "0000-0000-0000-0000-0000-0000-0000" });
    expect(wrong.status).toBe(404);

    // Terms that keep coverage with the original owner: the code path is closed to others.
    const [shop] = await sql<{ warranty_terms: Record<string, unknown> }>("select warranty_terms from shop_settings where id = 'shop'");
    await sql("update shop_settings set warranty_terms = warranty_terms || '{\"transferable\": false}'::jsonb where id = 'shop'");
    let personal: Awaited<ReturnType<typeof createCertificate>>;
    try {
      personal = await createCertificate();
    } finally {
      await sql("update shop_settings set warranty_terms = $1 where id = 'shop'", [JSON.stringify(shop!.warranty_terms)]);
    }
    const refused = await jonah.post("/api/claims/by-code", { ...hum, code: personal.code });
    expect(refused.status).toBe(403);
    expect(((await refused.json()) as { error: { message: string } }).error.message).toMatch(/only the owner/);
    // ...while the holder may still use the code.
    expect((await mira.post("/api/claims/by-code", { ...hum, code: personal.code })).status).toBe(201);
  });
});

describe("staff decide", () => {
  it("accepting opens a linked warranty job with covered lines at no charge and e-mails the claimant", async () => {
    const c = await createCertificate();
    const mira = await signedIn(DEMO.customer);
    const { claim } = (await (await mira.post("/api/claims", { ...hum, certificateId: c.certificateId })).json()) as {
      claim: { id: string };
    };
    expect((await mira.post(`/api/claims/${claim.id}/decision`, { decision: "accept" })).status).toBe(404);

    const tech = await signedIn(DEMO.tech);
    expect((await tech.get("/bench/claims")).status).toBe(200);
    const page = await (await tech.get(`/bench/claims/${claim.id}`)).text();
    expect(page).toContain("Likely covered");
    const t0 = Date.now() - 50;
    const res = await tech.post(`/api/claims/${claim.id}/decision`, {
      decision: "accept",
      reason: "The filter capacitor we fitted has failed.",
    });
    expect(res.status).toBe(200);
    const { warrantyJobId } = (await res.json()) as { warrantyJobId: string };
    const [job] = await sql<{ is_warranty: boolean; certificate_id: string; claim_id: string; customer_id: string; state: string }>(
      "select is_warranty, certificate_id, claim_id, customer_id, state from job where id = $1",
      [warrantyJobId],
    );
    expect(job).toEqual({
      is_warranty: true,
      certificate_id: c.certificateId,
      claim_id: claim.id,
      customer_id: IDS.mira,
      state: "in_triage",
    });
    const [est] = await sql<{ draft: { lines: { code: string; covered: boolean }[] } }>("select draft from estimate where job_id = $1", [
      warrantyJobId,
    ]);
    expect(est!.draft.lines.length).toBeGreaterThan(0);
    expect(est!.draft.lines.every((l) => l.covered)).toBe(true);
    expect(est!.draft.lines.map((l) => l.code)).toContain("recap.electrolytic");
    const [decided] = await sql<{ status: string; warranty_job_id: string }>("select status, warranty_job_id from claim where id = $1", [
      claim.id,
    ]);
    expect(decided).toEqual({ status: "accepted", warranty_job_id: warrantyJobId });
    await waitForMail(DEMO.customer.email, /Warranty claim accepted: Aurelian Model 5T/, { after: t0 });
    // Decided once: a second decision is refused.
    expect((await tech.post(`/api/claims/${claim.id}/decision`, { decision: "reject", reason: "Changed my mind" })).status).toBe(409);
    // With the claim decided, a new claim may be opened on the same certificate.
    expect((await mira.post("/api/claims", { ...hum, certificateId: c.certificateId })).status).toBe(201);
  });

  it("rejecting needs a reason, which the claimant receives; inspecting first keeps the claim open", async () => {
    const c = await createCertificate();
    const mira = await signedIn(DEMO.customer);
    const { claim } = (await (await mira.post("/api/claims", { ...hum, certificateId: c.certificateId })).json()) as {
      claim: { id: string };
    };
    const tech = await signedIn(DEMO.tech2);
    const t0 = Date.now() - 50;
    const inspect = await tech.post(`/api/claims/${claim.id}/decision`, {
      decision: "inspect",
      reason: "Please send the set so we can look at the filter section.",
    });
    expect(inspect.status).toBe(200);
    await waitForMail(DEMO.customer.email, /we would like to inspect your Aurelian Model 5T/, { after: t0 });
    expect((await mira.post("/api/claims", { ...hum, certificateId: c.certificateId })).status).toBe(409);

    const noReason = await tech.post(`/api/claims/${claim.id}/decision`, { decision: "reject", reason: "" });
    expect(noReason.status).toBe(400);
    expect(((await noReason.json()) as { error: { fields: Record<string, string> } }).error.fields.reason).toBeTruthy();
    const reject = await tech.post(`/api/claims/${claim.id}/decision`, {
      decision: "reject",
      reason: "The cabinet was cracked by a fall.",
      findings: ["excl.physical-damage"],
    });
    expect(reject.status).toBe(200);
    const mail = await waitForMail(DEMO.customer.email, /Warranty claim not covered: Aurelian Model 5T/, { after: t0 });
    expect(mail.text).toContain("The cabinet was cracked by a fall.");
    const [row] = await sql<{ status: string; advice: StoredAdvice }>("select status, advice from claim where id = $1", [claim.id]);
    expect(row!.status).toBe("rejected");
    expect(row!.advice.outcome).toBe("not-covered");
    const portal = await (await mira.get(`/portal/claims/${claim.id}`)).text();
    expect(portal).toContain("Not covered");
  });

  it("keeps anonymous visitors out of the claim routes", async () => {
    const anon = new TestClient();
    expect((await anon.get("/api/claims")).status).toBe(401);
    expect((await anon.post("/api/claims", hum)).status).toBe(401);
  });
});
