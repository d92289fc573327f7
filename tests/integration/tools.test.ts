import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { parseAlignmentRequest, runAlignmentTool } from "@/lib/engine/requests/alignment-request";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool } from "../support/db";
import { TestClient } from "../support/http";
import { AURELIAN_PROFILE } from "./bench-fixtures";

const MW = { band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455, gang: { minPF: 10, maxPF: 365 } };

let tech: TestClient;
let owner: TestClient;
let customer: TestClient;

beforeAll(async () => {
  [tech, owner, customer] = await Promise.all([signedIn(DEMO.tech), signedIn(DEMO.owner), signedIn(DEMO.customer)]);
});
afterAll(async () => {
  await closeTestPool();
});

describe("POST /api/tools/alignment", () => {
  it("answers staff with the engine's own figures", async () => {
    for (const client of [tech, owner]) {
      const res = await client.post("/api/tools/alignment", MW);
      expect(res.status).toBe(200);
      const body = await res.json();
      expect(body).toEqual(JSON.parse(JSON.stringify(runAlignmentTool(parseAlignmentRequest(MW)))));
      expect(body.lo).toEqual({ lowKHz: 995, highKHz: 2055 });
      // 101 even samples across the band, with the tracking points themselves added.
      const curveKHz = (body.design.errorCurve as { kHz: number }[]).map((p) => p.kHz);
      expect(curveKHz.length).toBeGreaterThanOrEqual(101);
      expect(curveKHz.length).toBeLessThanOrEqual(104);
      for (const p of body.trackingPointsKHz as number[]) expect(curveKHz).toContain(p);
    }
  });

  it("is not found for customers and asks visitors to sign in", async () => {
    expect((await customer.post("/api/tools/alignment", MW)).status).toBe(404);
    const anon = await new TestClient().post("/api/tools/alignment", MW);
    expect(anon.status).toBe(401);
  });

  it("answers bad input with field messages", async () => {
    const res = await tech.post("/api/tools/alignment", { band: { lowKHz: 1600, highKHz: 540 }, ifKHz: 3, gang: { minPF: 10, maxPF: 5 } });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as { error: { code: string; fields: Record<string, string> } };
    expect(error.code).toBe("invalid_input");
    expect(error.fields["band.highKHz"]).toMatch(/above the low end/);
    expect(error.fields.ifKHz).toMatch(/IF lies in/);
    expect(error.fields["gang.maxPF"]).toMatch(/above its minimum/);

    const missing = await tech.post("/api/tools/alignment", { band: { lowKHz: 540 } });
    expect(missing.status).toBe(400);
    const m = (await missing.json()) as { error: { fields: Record<string, string> } };
    expect(Object.keys(m.error.fields)).toEqual(expect.arrayContaining(["band.highKHz", "ifKHz"]));

    // The engine's own refusal: a gang that cannot cover the band.
    const narrow = await tech.post("/api/tools/alignment", { ...MW, gang: { minPF: 100, maxPF: 120 } });
    expect(narrow.status).toBe(400);
    const n = (await narrow.json()) as { error: { fields: Record<string, string> } };
    expect(Object.keys(n.error.fields).length).toBeGreaterThan(0);

    // A band and an IF of different families: refused on the IF field, as the set-profile form does.
    const fmIf = await tech.post("/api/tools/alignment", { ...MW, ifKHz: 10700 });
    expect(fmIf.status).toBe(400);
    expect(((await fmIf.json()) as { error: { fields: Record<string, string> } }).error.fields.ifKHz).toMatch(/needs an AM IF/);

    const notJson = await tech.request("/api/tools/alignment", {
      method: "POST",
      body: "{not json",
      headers: { "content-type": "application/json" },
    });
    expect(notJson.status).toBe(400);
  });
});

describe("POST /api/tools/alignment, what the door adds", () => {
  it("keeps the plan with a low oscillator and a gang, takes units, and opens a hot-chassis plan with the caution", async () => {
    const low = await tech.post("/api/tools/alignment", { ...MW, injection: "low" });
    expect(low.status).toBe(200);
    const body = (await low.json()) as { lo: unknown; steps: unknown[]; design: { method: string; notes: string[] } };
    expect(body.lo).toEqual({ lowKHz: 85, highKHz: 1145 });
    expect(body.design.method).toBe("signal-only");
    expect(body.design.notes.length).toBeGreaterThan(0);

    const units = await tech.post("/api/tools/alignment", {
      band: { lowKHz: "0.54 MHz", highKHz: "1600k" },
      ifKHz: "455 kHz",
      hotChassis: true,
    });
    expect(units.status).toBe(200);
    const u = (await units.json()) as { bandKind: string; lo: unknown; steps: { text: string }[] };
    expect(u.bandKind).toBe("MW");
    expect(u.lo).toEqual({ lowKHz: 995, highKHz: 2055 });
    expect(u.steps[0]?.text).toMatch(/isolation transformer/);
  });
});

describe("POST /api/tools/estimate", () => {
  it("prices a profile for staff", async () => {
    const res = await tech.post("/api/tools/estimate", { profile: AURELIAN_PROFILE });
    expect(res.status).toBe(200);
    const body = (await res.json()) as {
      lines: { code: string; labourMinor: number; partsMinor: number; billedMinutes: number }[];
      totals: {
        totalMinor: number;
        labourMinor: number;
        partsMinor: number;
        taxMinor: number;
        depositMinor: number;
        billingRounding: string;
        workedMinutes: number;
        billedMinutes: number;
        billingIncrementMinutes: number;
        roundingLabourMinor: number;
        billingNote: string;
      };
      cautions: { id: string; text: string }[];
    };
    expect(body.lines.map((l) => l.code)).toEqual(expect.arrayContaining(["safety.isolation-bench", "safety.y-capacitor", "test.leakage"]));
    // The demo shop rounds once per job: the worked minutes rounded up to the increment once (common practice).
    const t = body.totals;
    expect(t.billingRounding).toBe("job");
    expect(t.billedMinutes).toBe(Math.ceil(t.workedMinutes / t.billingIncrementMinutes) * t.billingIncrementMinutes);
    expect(t.billedMinutes - t.workedMinutes).toBeLessThan(t.billingIncrementMinutes);
    expect(t.billingNote).toContain(`billed as ${t.billedMinutes} minutes`);
    expect(t.labourMinor).toBe(body.lines.reduce((s, l) => s + l.labourMinor, 0) + t.roundingLabourMinor);
    expect(t.depositMinor).toBeLessThanOrEqual(t.totalMinor);
    expect(body.cautions.map((c) => c.id)).toEqual(expect.arrayContaining(["isolation", "discharge", "heater-string", "first-power"]));
  });

  it("keeps others out and explains bad profiles field by field", async () => {
    expect((await customer.post("/api/tools/estimate", { profile: AURELIAN_PROFILE })).status).toBe(404);
    expect((await new TestClient().post("/api/tools/estimate", { profile: AURELIAN_PROFILE })).status).toBe(401);
    const res = await tech.post("/api/tools/estimate", {
      profile: { ...AURELIAN_PROFILE, kind: "crystal", bands: [{ kind: "MW", lowKHz: 540, highKHz: 99000, ifKHz: 455 }] },
    });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(error.fields["profile.kind"]).toBeTruthy();
    expect(error.fields["profile.bands.0.highKHz"]).toMatch(/MW dial ends/);
  });
});
