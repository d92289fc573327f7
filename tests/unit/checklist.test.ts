import { describe, expect, test } from "vitest";
import {
  capacitorCurrentMA,
  computeCautions,
  computeChecklist,
  IMAGE_NOTE,
  leakageNetworkVolts,
  peakVolts,
  ruleCodes,
  ruleOfLineCode,
  setProfileSchema,
  timeConstantSeconds,
  type SetProfile,
} from "@/lib/engine/checklist";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import { leakageCeilings, toleranceSettingsSchema } from "@/lib/engine/verdicts/tolerances";
import { aurelianTableSet, corvanePortable, haldaneConsole } from "./support/demo-sets";
import { evaluate } from "./support/oracles";

const policy = defaultShopPolicy;
const codes = (p: SetProfile) => computeChecklist(p, policy).map((l) => l.code);
const line = (p: SetProfile, code: string) => computeChecklist(p, policy).find((l) => l.code === code);

describe("order of work, as at the bench (common practice: an unrestored set is never powered as received)", () => {
  // The bench sequence, from memory of restoration practice: inspect; make safe; safety parts and cord;
  // recap; first power-up through a limiter; alignment; tests; burn-in last.
  const stage = (code: string): number => {
    if (code === "inspect.intake") return 0;
    if (code === "safety.isolation-bench" || code === "safety.discharge-filter-caps" || code === "inspect.tubes") return 1;
    if (/^safety\.(y-capacitor|polarized-plug-fuse|fuse|line-cord|selenium)$/.test(code)) return 2;
    if (code.startsWith("recap.") || code === "mech.battery-compartment") return 3;
    if (code === "safety.current-limited-power-up") return 4;
    if (code === "inspect.transistors" || code === "inspect.fault-find" || code.startsWith("mech.")) return 5;
    if (code.startsWith("align.")) return 6;
    if (code === "test.voltages" || code === "test.leakage") return 7;
    if (code === "test.burn-in") return 8;
    throw new Error(`no bench stage for ${code}`);
  };

  test.each([
    ["Aurelian AC/DC table set", aurelianTableSet],
    ["Corvane battery portable", corvanePortable],
    ["Haldane transformer console", haldaneConsole],
  ])("%s: lines follow the bench stages", (_name, profile) => {
    const stages = codes(profile).map(stage);
    expect(stages).toEqual([...stages].sort((a, b) => a - b));
  });

  test("the first power-up comes after the line cord, the Y-class capacitor and the recap, and says why", () => {
    const c = codes(aurelianTableSet);
    const at = (code: string) => c.indexOf(code);
    for (const before of ["safety.line-cord", "safety.y-capacitor", "recap.electrolytic", "recap.paper"]) {
      expect(at(before)).toBeGreaterThanOrEqual(0);
      expect(at(before)).toBeLessThan(at("safety.current-limited-power-up"));
    }
    expect(line(aurelianTableSet, "safety.current-limited-power-up")?.reason).toMatch(/after the safety parts, the cord and the recap/);
    expect(line(aurelianTableSet, "safety.current-limited-power-up")?.reason).toMatch(/never powered as received/);
  });

  test("burn-in is last and the leakage hot check comes after all other work", () => {
    for (const p of [aurelianTableSet, haldaneConsole]) {
      const c = codes(p);
      expect(c.at(-1)).toBe("test.burn-in");
      expect(c.indexOf("test.leakage")).toBeGreaterThan(Math.max(...c.filter((x) => x.startsWith("align.")).map((x) => c.indexOf(x))));
    }
  });

  test("the dial cord is restrung before alignment, so the dial can be calibrated", () => {
    const c = codes(haldaneConsole);
    expect(c.indexOf("mech.dial-cord")).toBeLessThan(c.indexOf("align.if.455"));
  });
});

describe("discharge voltage of the filter capacitors (REFERENCES: AC/DC ≈ mains peak; transformer sets 250–450 V, common practice)", () => {
  const discharge = (p: SetProfile) => line(p, "safety.discharge-filter-caps")?.reason ?? "";

  test("a 120 V AC/DC set: about 170 V, the half-wave peak (computed: 120 × √2 = 169.7, oracle mathjs)", () => {
    expect(Math.round(evaluate("120 * sqrt(2)") as number)).toBe(170);
    expect(discharge(aurelianTableSet)).toMatch(/about 170 V/);
  });

  test("a transformer set with its B+ known uses the set's B+, never the mains peak", () => {
    expect(discharge(haldaneConsole)).toMatch(/about 250 V, the set's B\+/);
    expect(discharge(haldaneConsole)).not.toMatch(/170 V/);
  });

  test("a transformer set without a B+ states the range for the kind of set: 250–450 V", () => {
    const { bPlusVolts: _drop, ...noBPlus } = haldaneConsole;
    expect(discharge(noBPlus)).toMatch(/250–450 V/);
    expect(discharge(noBPlus)).not.toMatch(/170 V/);
  });

  test("the bench caution says the same", () => {
    const { bPlusVolts: _drop, ...noBPlus } = haldaneConsole;
    expect(computeCautions(noBPlus).find((c) => c.id === "discharge")?.text).toMatch(/250–450 V/);
  });
});

describe("IF transformers are counted per IF strip (common practice: each strip is aligned on its own)", () => {
  test("an AM/FM console with 2 AM and 3 FM transformers is charged 2 at 455 kHz and 3 at 10.7 MHz, 5 in all", () => {
    expect(line(haldaneConsole, "align.if.455")?.quantity).toBe(2);
    expect(line(haldaneConsole, "align.if.10700")?.quantity).toBe(3);
    const total = computeChecklist(haldaneConsole, policy)
      .filter((l) => l.rule === "align.if")
      .reduce((s, l) => s + l.quantity, 0);
    expect(total).toBe(5);
  });

  test("without an FM count, the AM count is not charged to the FM strip: the usual three are", () => {
    const { ifTransformersFm: _drop, ...p } = haldaneConsole;
    expect(line({ ...p, ifTransformers: 4 }, "align.if.455")?.quantity).toBe(4);
    expect(line({ ...p, ifTransformers: 4 }, "align.if.10700")?.quantity).toBe(3);
  });

  test("an FM-only set's single count belongs to its only strip", () => {
    const fmOnly = setProfileSchema.parse({
      kind: "transistor-mains",
      bands: [{ kind: "FM", lowKHz: 88000, highKHz: 108000, ifKHz: 10700 }],
      electrolytics: 1,
      paperCapacitors: 0,
      ifTransformers: 4,
    });
    expect(line(fmOnly, "align.if.10700")?.quantity).toBe(4);
  });
});

describe("trade advice where it applies (common practice; from memory of service notes)", () => {
  const text = (p: SetProfile) =>
    computeChecklist(p, policy)
      .map((l) => l.reason)
      .join(" ") +
    " " +
    computeCautions(p)
      .map((c) => c.text)
      .join(" ");

  test("AC/DC: a plain cord in place of a resistance cord burns out the tubes; the heaters are a series string", () => {
    expect(line(aurelianTableSet, "safety.line-cord")?.reason).toMatch(/resistance cord/);
    expect(line(aurelianTableSet, "safety.line-cord")?.reason).toMatch(/plain cord .* burns out the tubes/);
    expect(computeCautions(aurelianTableSet).find((c) => c.id === "heater-string")?.text).toMatch(/series string/);
  });

  test("AC/DC: the antenna-lead coupling capacitor is Y-class; chassis-to-cabinet isolation (set screws, back cover)", () => {
    expect(line(aurelianTableSet, "safety.y-capacitor")?.reason).toMatch(/antenna-lead coupling capacitor/);
    const t = text(aurelianTableSet);
    expect(t).toMatch(/knob set screws/);
    expect(t).toMatch(/back cover/);
  });

  test("transformer sets: line bypass Y-class or removed, across-the-line X-class, optional three-wire cord, transformer insulation check before power (published: IEC 60384-14 classes)", () => {
    const y = line(haldaneConsole, "safety.y-capacitor")?.reason ?? "";
    expect(y).toMatch(/Y-class part .* or removed/);
    expect(y).toMatch(/across the line .* X-class/);
    expect(line(haldaneConsole, "safety.line-cord")?.reason).toMatch(/grounded three-wire cord/);
    expect(line(haldaneConsole, "safety.current-limited-power-up")?.reason).toMatch(/insulation check of the mains transformer/);
    // Not advice for an AC/DC set, which has no mains transformer.
    expect(text(aurelianTableSet)).not.toMatch(/three-wire|mains transformer/);
  });

  test("FM: defeat the AFC while aligning", () => {
    expect(line(haldaneConsole, "align.tracking.3")?.reason).toMatch(/AFC defeated/);
    expect(line(haldaneConsole, "align.if.10700")?.reason).toMatch(/Defeat the AFC/);
    expect(line(haldaneConsole, "align.fm-detector")?.reason).toMatch(/AFC defeated/);
    expect(line(haldaneConsole, "align.if.455")?.reason).not.toMatch(/AFC/);
  });

  test("AM: rock the gang while setting the low end, finish on the high-end trimmer", () => {
    const r = line(aurelianTableSet, "align.tracking.0")?.reason ?? "";
    expect(r).toMatch(/rocking the gang/);
    expect(r).toMatch(/finish on the high-end trimmer/);
  });

  test("battery portables: idle current draw and bias voltages instead of in-circuit gain checks; no rectifier wording", () => {
    const r = line(corvanePortable, "inspect.transistors")?.reason ?? "";
    expect(r).toMatch(/idle current draw/);
    expect(r).toMatch(/bias voltages/);
    expect(r).toMatch(/without in-circuit gain checks/);
    const withSelenium = { ...corvanePortable, seleniumRectifier: true };
    expect(text(withSelenium)).not.toMatch(/rectifier/i);
    expect(codes(withSelenium)).not.toContain("safety.selenium");
  });

  test("where images are spoken of: an RF stage roughly doubles the image rejection in dB (textbook: a second equal tuned circuit multiplies the rejection, so its dB add)", () => {
    expect(IMAGE_NOTE).toMatch(/roughly doubles the image rejection in dB/);
    expect(line(haldaneConsole, "align.tracking.1")?.reason).toContain(IMAGE_NOTE);
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

  test("230 V sets: the published IEC 60065 Annex D limit, 0.7 mA peak, is 0.49 mA rms on a sine (published: IEC 60065 Annex D; computed 0.7/√2 = 0.495, oracle mathjs)", () => {
    const p = { ...aurelianTableSet, mainsVolts: 230 as const };
    expect(evaluate("0.7 / sqrt(2)") as number).toBeGreaterThanOrEqual(leakageCeilings.v230.limitMA);
    expect(leakageCeilings.v230.limitMA).toBe(0.49);
    expect(line(p, "test.leakage")?.reason).toMatch(/\(0\.49 mA\) on a 230 V set/);
    // No false precision: never more than two significant figures.
    expect(String(policy.tolerances.leakageLimitMA.v230).replace(/^0\.0*/, "").length).toBeLessThanOrEqual(2);
  });

  test("a shop may make a leakage limit stricter but never looser than the published ceiling (0.5 mA at 120 V: UL 101)", () => {
    const t = policy.tolerances;
    const withLimit = (v120: number, v230: number) => toleranceSettingsSchema.safeParse({ ...t, leakageLimitMA: { v120, v230 } });
    expect(withLimit(0.3, 0.2).success).toBe(true);
    expect(withLimit(0.5, 0.49).success).toBe(true);
    const loose = withLimit(10, 0.49);
    expect(loose.success).toBe(false);
    expect(loose.error?.issues[0]?.path.join(".")).toBe("leakageLimitMA.v120");
    expect(loose.error?.issues[0]?.message).toMatch(/at most 0\.5 mA, the published limit/);
    expect(withLimit(0.5, 0.6).success).toBe(false);
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
