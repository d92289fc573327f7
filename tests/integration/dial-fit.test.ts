import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool } from "../support/db";
import { TestClient } from "../support/http";

/*
 * A 540–1600 kHz set on the 10–365 pF gang, points 600 / 1000 / 1400, whose coil reads 3 % high and whose
 * trimmer is 4 pF low. Readings computed in SI from f = 1/(2π√(LC)) with the design the numeric oracle solves
 * (tests/unit/dial-fit.test.ts): design L_o 123.03 µH, T_o 55.99 pF, P 413.25 pF (REFERENCES: typical MW design).
 */
const TWO_PI = 2 * Math.PI;
const Ls = 216.8175;
const Ts = 355 / ((1600 / 540) ** 2 - 1);
const loAt = (dialKHz: number, lo = 123.0312 * 1.03, to = 55.992 - 4, p = 413.2526) => {
  const g = 1 / ((TWO_PI * dialKHz * 1e3) ** 2 * Ls * 1e-6) / 1e-12 - Ts;
  const c = (p * (g + to)) / (p + g + to);
  return 1 / (TWO_PI * Math.sqrt(lo * 1e-6 * c * 1e-12)) / 1e3;
};
const round1 = (x: number) => Math.round(x * 10) / 10;

const MW = {
  band: { lowKHz: 540, highKHz: 1600 },
  ifKHz: 455,
  gang: { minPF: 10, maxPF: 365 },
  trackingPointsKHz: [600, 1000, 1400],
  readings: [
    { dialKHz: 600, receivedKHz: round1(loAt(600) - 455) },
    { dialKHz: 1000, receivedKHz: round1(loAt(1000) - 455) },
    { dialKHz: 1400, loKHz: round1(loAt(1400)) },
    { dialKHz: 1600, loKHz: round1(loAt(1600)) },
  ],
};

type Body = {
  fit: { inductanceErrorPct: number; parallelErrorPF: number; residualKHz: number };
  before: { dialKHz: number; receivedKHz: number; errorKHz: number; verdict: string }[];
  after: { dialKHz: number; receivedKHz: number; errorKHz: number }[];
  steps: { order: number; adjust: string; direction: string; amount: number; unit: string; text: string }[];
  gang: { minPF: number; maxPF: number; source: string };
};
type Bad = { error: { code: string; message: string; fields: Record<string, string> } };

let tech: TestClient;
let owner: TestClient;
let customer: TestClient;

beforeAll(async () => {
  [tech, owner, customer] = await Promise.all([signedIn(DEMO.tech), signedIn(DEMO.owner), signedIn(DEMO.customer)]);
});
afterAll(async () => {
  await closeTestPool();
});

describe("POST /api/tools/dial-fit", () => {
  it("answers staff with the fit, the verdicts and the steps", async () => {
    for (const client of [tech, owner]) {
      const res = await client.post("/api/tools/dial-fit", MW);
      expect(res.status).toBe(200);
      const body = (await res.json()) as Body;
      expect(Math.abs(body.fit.inductanceErrorPct - 3)).toBeLessThan(0.1);
      expect(Math.abs(body.fit.parallelErrorPF - -4)).toBeLessThan(0.2);
      expect(body.before.map((b) => b.dialKHz)).toEqual([600, 1000, 1400, 1600]);
      // The LO read on the counter at 1400 is judged as received = LO − IF (REFERENCES: one error, one verdict).
      expect(body.before[2].receivedKHz).toBeCloseTo(round1(loAt(1400)) - 455, 6);
      // 600 kHz reads about 12 kHz low: outside max(10 kHz, 1 %) (REFERENCES: MW dial point, common practice).
      expect(body.before[0].verdict).toBe("fail");
      expect(body.steps.map((s) => [s.order, s.adjust, s.direction, s.unit])).toEqual([
        [1, "coil", "decrease", "µH"],
        [2, "trimmer", "increase", "pF"],
      ]);
      expect(body.after.map((a) => a.dialKHz)).toEqual([600, 1000, 1400, 1600]);
      expect(body.after[0].errorKHz).toBeCloseTo(0, 3);
      expect(body.gang.source).toBe("given");
    }
  });

  it("states the gang it assumed, and with a padder as the low-end adjuster advises the padder", async () => {
    const { gang: _gang, ...noGang } = MW;
    const res = await tech.post("/api/tools/dial-fit", { ...noGang, lowEndAdjuster: "padder" });
    expect(res.status).toBe(200);
    const body = (await res.json()) as Body;
    expect(body.gang).toMatchObject({ minPF: 10, maxPF: 365, source: "default" });
    expect(body.steps.map((s) => s.adjust)).toEqual(["padder", "trimmer"]);
    expect(body.steps[0].unit).toBe("pF");
  });

  it("is not found for customers and asks visitors to sign in", async () => {
    expect((await customer.post("/api/tools/dial-fit", MW)).status).toBe(404);
    expect((await new TestClient().post("/api/tools/dial-fit", MW)).status).toBe(401);
  });

  it("answers each kind of bad input with a 400 naming the field", async () => {
    const post = async (body: unknown) => {
      const res = await tech.post("/api/tools/dial-fit", body);
      expect(res.status).toBe(400);
      const b = (await res.json()) as Bad;
      expect(b.error.code).toBe("invalid_input");
      return b.error.fields;
    };
    // Fewer than two readings at different marks.
    expect((await post({ ...MW, readings: [MW.readings[0]] })).readings).toMatch(/two or more/);
    expect((await post({ ...MW, readings: [MW.readings[0], { dialKHz: 600, receivedKHz: 589 }] })).readings).toMatch(
      /different dial marks/,
    );
    // A mark outside the band.
    expect((await post({ ...MW, readings: [...MW.readings, { dialKHz: 1700, receivedKHz: 1700 }] }))["readings.4.dialKHz"]).toMatch(
      /on the band/,
    );
    // Physically impossible: a negative frequency, an LO below the IF with the oscillator above the signal,
    // both kinds of reading at once.
    expect((await post({ ...MW, readings: [...MW.readings, { dialKHz: 800, receivedKHz: -790 }] }))["readings.4.receivedKHz"]).toMatch(
      /greater than zero/,
    );
    expect((await post({ ...MW, readings: [...MW.readings, { dialKHz: 800, loKHz: 300 }] }))["readings.4.loKHz"]).toMatch(/above the IF/);
    expect(
      (await post({ ...MW, readings: [...MW.readings, { dialKHz: 800, receivedKHz: 790, loKHz: 1245 }] }))["readings.4.loKHz"],
    ).toMatch(/not both/);
    // Readings the model cannot explain: true at the ends, 40 kHz out in the middle (a slipped pointer).
    const slipped = await post({
      ...MW,
      readings: [
        { dialKHz: 600, receivedKHz: 600 },
        { dialKHz: 1000, receivedKHz: 1040 },
        { dialKHz: 800, receivedKHz: 760 },
        { dialKHz: 1400, receivedKHz: 1400 },
      ],
    });
    expect(slipped.readings).toMatch(/residual/);
    // A bad band or IF, as the alignment calculator refuses them.
    const band = await post({ ...MW, band: { lowKHz: 1600, highKHz: 540 }, ifKHz: 3 });
    expect(band["band.highKHz"]).toMatch(/above the low end/);
    expect(band.ifKHz).toMatch(/IF lies in/);
  });
});
