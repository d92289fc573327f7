import { describe, expect, test } from "vitest";
import {
  capacitorCurrentMA,
  computeChecklist,
  leakageNetworkVolts,
  peakVolts,
  ruleCodes,
  ruleOfLineCode,
  setProfileSchema,
  timeConstantSeconds,
  type SetProfile,
} from "@/lib/engine/checklist";
import { priceEstimate } from "@/lib/engine/pricing";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import { aurelianTableSet, corvanePortable, haldaneConsole } from "./support/demo-sets";
import { evaluate } from "./support/oracles";

const policy = defaultShopPolicy;
const codes = (p: SetProfile) => computeChecklist(p, policy).map((l) => l.code);
const line = (p: SetProfile, code: string) => computeChecklist(p, policy).find((l) => l.code === code);

describe("checklist snapshots of the demo sets", () => {
  test.each([
    ["Aurelian five-tube AC/DC table set", aurelianTableSet],
    ["Corvane seven-transistor portable", corvanePortable],
    ["Haldane console with two shortwave bands and FM", haldaneConsole],
  ])("%s", (_name, profile) => {
    const lines = computeChecklist(profile, policy);
    expect({ lines, totals: priceEstimate(lines, policy).totals }).toMatchSnapshot();
  });
});

describe("safety rules", () => {
  test("AC/DC sets always get the isolation bench, a Y-class capacitor, a polarized plug and fuse, and the leakage test", () => {
    const c = codes(aurelianTableSet);
    for (const code of [
      "safety.isolation-bench",
      "safety.y-capacitor",
      "safety.polarized-plug-fuse",
      "test.leakage",
      "safety.discharge-filter-caps",
      "safety.current-limited-power-up",
    ]) {
      expect(c).toContain(code);
    }
  });

  test("AC/DC bench work through an isolation transformer, final leakage hot check without it (common practice; service manuals)", () => {
    expect(line(aurelianTableSet, "safety.isolation-bench")?.reason).toMatch(
      /isolation transformer.*final leakage hot check is made without it/,
    );
    expect(line(aurelianTableSet, "test.leakage")?.reason).toMatch(/without the isolation transformer/);
    expect(line(aurelianTableSet, "safety.isolation-bench")?.reason).toMatch(/local electrical codes and licensed practice/);
  });

  test("line-to-chassis capacitor class Y (Y1, or Y2 on ≤ 250 V mains) (published: IEC 60384-14 class definitions)", () => {
    const l = line(aurelianTableSet, "safety.y-capacitor");
    expect(l?.reason).toMatch(/Y-class part \(Y1, or Y2 on mains up to 250 V\)/);
    expect(l?.parts).toEqual([{ code: "cap.y2", quantity: 1 }]);
  });

  test("polarized plug, wide blade neutral (published: ANSI/NEMA WD 6); chassis to neutral, switch in the line side, add a fuse (common practice)", () => {
    const reason = line(aurelianTableSet, "safety.polarized-plug-fuse")?.reason ?? "";
    expect(reason).toMatch(/wide \(neutral\) blade/);
    expect(reason).toMatch(/switch in the line side/);
    expect(reason).toMatch(/add a fuse/);
  });

  test("every mains set gets the leakage test with both plug readings; battery sets do not", () => {
    for (const p of [aurelianTableSet, haldaneConsole, { ...corvanePortable, kind: "transistor-mains" as const }]) {
      expect(line(p, "test.leakage")?.readings).toEqual(["leakage.plug-a", "leakage.plug-b"]);
    }
    expect(codes(corvanePortable)).not.toContain("test.leakage");
  });

  test("leakage at most 0.75 V rms across 1.5 kΩ ∥ 0.15 µF, i.e. 0.5 mA on a 120 V two-wire set (published: US service-manual hot check; UL 101 family limits)", () => {
    expect(leakageNetworkVolts(0.5)).toBeCloseTo(0.75, 12);
    expect(line(aurelianTableSet, "test.leakage")?.reason).toMatch(/0\.75 V rms across the network \(0\.5 mA\)/);
  });

  test("230 V sets: 0.35 V across the same network (0.233 mA) is excessive (published: service manual for a 230 V product)", () => {
    const p = { ...aurelianTableSet, mainsVolts: 230 as const };
    expect(leakageNetworkVolts(0.233)).toBeCloseTo(0.35, 2);
    expect(line(p, "test.leakage")?.reason).toMatch(/0\.35 V rms across the network \(0\.233 mA\) on a 230 V set/);
  });

  test("selenium rectifier → silicon diode plus series resistor (published restoration notes; service practice)", () => {
    const l = line(haldaneConsole, "safety.selenium");
    expect(l?.reason).toMatch(/silicon diode plus a series resistor/);
    expect(l?.parts.map((p) => p.code)).toEqual(["diode.silicon", "resistor.series"]);
    expect(codes(aurelianTableSet)).not.toContain("safety.selenium");
  });

  test("first power-up through a current-limiting lamp or variac (published restoration notes)", () => {
    expect(line(haldaneConsole, "safety.current-limited-power-up")?.reason).toMatch(/current-limiting lamp or a variac/);
  });

  test("replace paper and electrolytic capacitors, leave mica, ceramic and air variables (published restoration guides; common practice)", () => {
    expect(line(haldaneConsole, "recap.paper")?.reason).toMatch(/Mica, ceramic and air-variable capacitors stay unless faulty/);
    expect(line(haldaneConsole, "recap.paper")?.quantity).toBe(22);
    expect(line(haldaneConsole, "recap.electrolytic")?.quantity).toBe(4);
  });
});

describe("safety figures", () => {
  const oracleMA = (nF: number) => evaluate(`2 pi 60 Hz * ${nF} nF * 120 V`).toNumber("mA") as number;

  test("I = 2πfCV at 120 V 60 Hz: 2.2 nF → 0.0995 mA, 10 nF → 0.452 mA, 47 nF → 2.13 mA (computed; oracle: mathjs units)", () => {
    expect(capacitorCurrentMA(2.2, 120, 60)).toBeCloseTo(0.0995, 4);
    expect(capacitorCurrentMA(10, 120, 60)).toBeCloseTo(0.452, 3);
    expect(capacitorCurrentMA(47, 120, 60)).toBeCloseTo(2.13, 2);
    for (const nF of [2.2, 10, 47]) expect(capacitorCurrentMA(nF, 120, 60)).toBeCloseTo(oracleMA(nF), 12);
  });

  test("an old 0.05 µF line bypass alone fails 0.5 mA (computed)", () => {
    expect(capacitorCurrentMA(50, 120, 60)).toBeGreaterThan(0.5);
    expect(line(aurelianTableSet, "safety.y-capacitor")?.reason).toMatch(/about 2\.3 mA at 120 V 60 Hz/);
  });

  test("half-wave peak of 120 V rms is 169.7 V (computed; oracle: mathjs)", () => {
    expect(peakVolts(120)).toBeCloseTo(169.7, 1);
    expect(peakVolts(120)).toBeCloseTo(evaluate("120 * sqrt(2)") as number, 12);
  });

  test("40 µF with a 220 kΩ bleeder: τ = 8.8 s (computed; oracle: mathjs units)", () => {
    expect(timeConstantSeconds(40, 220)).toBeCloseTo(8.8, 9);
    expect(timeConstantSeconds(40, 220)).toBeCloseTo(evaluate("40 uF * 220 kohm").toNumber("s") as number, 12);
  });
});

describe("alignment and readings per band", () => {
  test("every band gets its tracking line and band-edge readings", () => {
    const lines = computeChecklist(haldaneConsole, policy);
    haldaneConsole.bands.forEach((_, i) => {
      expect(lines.find((l) => l.code === `align.tracking.${i}`)?.readings).toEqual([
        `band.${i}.lo.low`,
        `band.${i}.lo.high`,
        `band.${i}.track.0`,
        `band.${i}.track.1`,
        `band.${i}.track.2`,
      ]);
      expect(lines.find((l) => l.code === `align.dial.${i}`)?.readings).toEqual([`band.${i}.edge.low`, `band.${i}.edge.high`]);
    });
  });

  test("one IF line per distinct IF, and an FM detector line when the set has FM", () => {
    const c = codes(haldaneConsole);
    expect(c.filter((x) => x.startsWith("align.if."))).toEqual(["align.if.455", "align.if.10700"]);
    expect(c).toContain("align.fm-detector");
    expect(codes(aurelianTableSet)).not.toContain("align.fm-detector");
  });

  test("shortwave tracking reasons carry the trimmer-from-minimum caution", () => {
    expect(line(haldaneConsole, "align.tracking.1")?.reason).toMatch(/up from minimum so the oscillator lands above the signal/);
  });
});

describe("determinism and shop minutes", () => {
  test("the same profile always gives the same lines, in rule order", () => {
    expect(computeChecklist(haldaneConsole, policy)).toEqual(computeChecklist(haldaneConsole, policy));
    const order = computeChecklist(haldaneConsole, policy).map((l) => ruleCodes.indexOf(l.rule));
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    for (const l of computeChecklist(haldaneConsole, policy)) expect(ruleOfLineCode(l.code)).toBe(l.rule);
  });

  test("minutes come from the shop policy", () => {
    const custom = { ...policy, minutesPerRule: { ...policy.minutesPerRule, "recap.paper": 9 } };
    expect(computeChecklist(haldaneConsole, custom).find((l) => l.rule === "recap.paper")?.minutes).toBe(9);
  });

  test("symptoms add fault finding", () => {
    expect(codes(corvanePortable)).toContain("inspect.fault-find");
    expect(codes(aurelianTableSet)).not.toContain("inspect.fault-find");
  });
});

describe("set profile schema", () => {
  test("coerces form data", () => {
    const p = setProfileSchema.parse({
      kind: "tube-acdc",
      bands: [{ kind: "MW", lowKHz: "540", highKHz: "1600", ifKHz: "455" }],
      electrolytics: "2",
      paperCapacitors: "7",
      tubes: "5",
      lineCordWorn: "on",
      seleniumRectifier: "",
      mainsVolts: "120",
    });
    expect(p).toMatchObject({
      electrolytics: 2,
      paperCapacitors: 7,
      tubes: 5,
      lineCordWorn: true,
      seleniumRectifier: false,
      mainsVolts: 120,
    });
    expect(p.bands[0].lowKHz).toBe(540);
  });

  test("rejects a band typed in MHz and an IF outside the plausible range, naming the field", () => {
    const r = setProfileSchema.safeParse({
      kind: "tube-transformer",
      bands: [{ kind: "FM", lowKHz: 88, highKHz: 108, ifKHz: 10.7 }],
      electrolytics: 1,
      paperCapacitors: 1,
    });
    expect(r.success).toBe(false);
    const paths = r.error?.issues.map((i) => i.path.join(".")) ?? [];
    expect(paths).toEqual(expect.arrayContaining(["bands.0.lowKHz", "bands.0.ifKHz"]));
  });
});
