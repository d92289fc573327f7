import { describe, expect, test } from "vitest";
import {
  bandFrequencies,
  capacitanceRatio,
  checkAlignmentBasis,
  imageKHz,
  imageRejection,
  localOscillatorKHz,
  planAlignment,
  resonantKHz,
  resonantPF,
  resonantUH,
} from "@/lib/engine/alignment";
import { EngineError } from "@/lib/engine/engine-error";
import { evaluate } from "./support/oracles";

describe("resonance", () => {
  test("150 µH resonates with 675.5 pF at 500 kHz and 75.05 pF at 1500 kHz (textbook example: FOSSEE companion 2498, ch. 5, ex. 5.30)", () => {
    expect(resonantPF(150, 500)).toBeCloseTo(675.5, 1);
    expect(resonantPF(150, 1500)).toBeCloseTo(75.05, 2);
    expect(resonantKHz(150, resonantPF(150, 500))).toBeCloseTo(500, 9);
    expect(resonantUH(675.47, 500)).toBeCloseTo(150, 2);
  });

  test("resonance agrees with mathjs units (oracle)", () => {
    const c = evaluate("1 / ((2 pi 500 kHz)^2 * 150 uH)").toNumber("pF") as number;
    expect(resonantPF(150, 500)).toBeCloseTo(c, 9);
  });

  test("bad inputs give the engine's error, never NaN", () => {
    expect(() => resonantKHz(0, 100)).toThrow(EngineError);
    expect(() => resonantPF(150, Number.POSITIVE_INFINITY)).toThrow(EngineError);
  });
});

describe("superheterodyne relations", () => {
  test("LO 1455 kHz for 1000 kHz with a 455 kHz IF above, 545 kHz below (definition of the superheterodyne: f_LO − f_RF = f_IF)", () => {
    expect(localOscillatorKHz(1000, 455)).toBe(1455);
    expect(localOscillatorKHz(1000, 455, "low")).toBe(545);
  });

  test("image f_RF + 2 f_IF: 1000 kHz, IF 455 → 1910 kHz (textbook example: FOSSEE companion 1409, ch. 8, ex. 8.3)", () => {
    expect(imageKHz(1000, 455)).toBe(1910);
  });

  test("a 1500 kHz station is heard as an image with the dial at 570 kHz when the IF is 465 kHz (textbook example: FOSSEE 1409, ch. 8, ex. 8.4)", () => {
    expect(imageKHz(570, 465)).toBe(1500);
  });

  test("image rejection at 1000 kHz, IF 455, Q 80: ρ = 1.3864, α ≈ 110.9 (40.9 dB) (textbook example: FOSSEE 1409 ex. 8.3)", () => {
    const r = imageRejection(1000, 455, 80);
    expect(r.rho).toBeCloseTo(1.3864, 4);
    expect(r.ratio).toBeCloseTo(110.9, 1);
    expect(r.dB).toBeCloseTo(40.9, 1);
  });

  test("image rejection at 50 MHz, IF 455, Q 80: ρ = 0.03607, α ≈ 3.05 (textbook example: FOSSEE 1409 ex. 8.3)", () => {
    const r = imageRejection(50000, 455, 80);
    expect(r.rho).toBeCloseTo(0.03607, 5);
    expect(r.ratio).toBeCloseTo(3.05, 2);
  });

  test("capacitance ratio 540–1600 kHz: signal 8.779, oscillator with IF 455 high side 4.266 (computed; oracle: mathjs)", () => {
    const f = bandFrequencies(checkAlignmentBasis({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455 }));
    expect(f.capacitanceRatio.signal).toBeCloseTo(8.779, 3);
    expect(f.capacitanceRatio.oscillator).toBeCloseTo(4.266, 3);
    expect(f.capacitanceRatio.signal).toBeCloseTo(evaluate("(1600/540)^2") as number, 12);
    expect(f.capacitanceRatio.oscillator).toBeCloseTo(evaluate("((1600+455)/(540+455))^2") as number, 12);
    expect(capacitanceRatio(540, 1600)).toBe(f.capacitanceRatio.signal);
  });

  test("530–1650 kHz, IF 455: oscillator ratio 4.567 with the LO high, 253.87 with it low (textbook example: FOSSEE 1409 ex. 8.6)", () => {
    expect(
      bandFrequencies(checkAlignmentBasis({ band: { lowKHz: 530, highKHz: 1650 }, ifKHz: 455, injection: "high" })).capacitanceRatio
        .oscillator,
    ).toBeCloseTo(4.567, 3);
    expect(
      bandFrequencies(checkAlignmentBasis({ band: { lowKHz: 530, highKHz: 1650 }, ifKHz: 455, injection: "low" })).capacitanceRatio
        .oscillator,
    ).toBeCloseTo(253.87, 2);
  });

  test("LO and image ranges of a band", () => {
    const f = bandFrequencies(checkAlignmentBasis({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455 }));
    expect(f.lo).toEqual({ lowKHz: 995, highKHz: 2055 });
    expect(f.image).toEqual({ lowKHz: 1450, highKHz: 2510 });
  });

  test("low-side injection below the IF is refused on the band's low end, at the door", () => {
    try {
      checkAlignmentBasis({ band: { lowKHz: 300, highKHz: 1600 }, ifKHz: 455, injection: "low" });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(EngineError);
      expect((e as EngineError).field).toBe("band.lowKHz");
    }
  });
});

describe("alignment plan order (common practice: service-manual alignment order)", () => {
  test("MW: IF first at low level, then low point with coil or padder, high point with trimmer, repeat", () => {
    const plan = planAlignment(checkAlignmentBasis({ band: { lowKHz: 540, highKHz: 1600, kind: "MW" }, ifKHz: 455 }));
    const texts = plan.steps.map((s) => s.text);
    const at = (re: RegExp) => texts.findIndex((t) => re.test(t));
    expect(at(/^IF first/)).toBeGreaterThan(-1);
    expect(texts[at(/^IF first/)]).toMatch(/low generator level/);
    expect(at(/^IF first/)).toBeLessThan(at(/^Low point/));
    expect(texts[at(/^Low point/)]).toMatch(/coil slug or padder/);
    expect(at(/^Low point/)).toBeLessThan(at(/^High point/));
    expect(texts[at(/^High point/)]).toMatch(/trimmer/);
    expect(at(/^High point/)).toBeLessThan(at(/^Repeat/));
    expect(plan.steps.map((s) => s.order)).toEqual(plan.steps.map((_, i) => i + 1));
  });

  test("SW: the oscillator trimmer is brought up from minimum so the LO lands above the signal", () => {
    const plan = planAlignment(checkAlignmentBasis({ band: { lowKHz: 5900, highKHz: 18000, kind: "SW" }, ifKHz: 455 }));
    expect(plan.steps.some((s) => /trimmer at minimum capacitance and bring it up/.test(s.text) && /above the signal/.test(s.text))).toBe(
      true,
    );
  });

  // Common practice (REFERENCES.md, alignment order): more trimmer capacitance lowers the LO, so coming up from
  // minimum the first response met has the LO above the signal; with the LO below, the wanted one is the second.
  test("SW with the LO below: the first response met is the LO above the signal, not the wanted one; the second is", () => {
    const plan = planAlignment(checkAlignmentBasis({ band: { lowKHz: 5900, highKHz: 18000 }, ifKHz: 455, injection: "low" }));
    const step = plan.steps.find((s) => /trimmer at minimum capacitance/.test(s.text))?.text ?? "";
    expect(step).toMatch(/first response met is the LO above the signal/);
    expect(step).not.toMatch(/as wanted/);
    expect(step).toMatch(/second response.*wanted/);
  });

  // The image of a station at f heard with the dial at d satisfies |d ± IF ∓ f| = IF: with the LO above it lies
  // at d = f − 2·IF, with the LO below at d = f + 2·IF (textbook: FOSSEE 1409 ch. 8, image f + 2 f_IF).
  test("SW image check: judged by the side of the mark, two IFs away, not by loudness", () => {
    const high = planAlignment(checkAlignmentBasis({ band: { lowKHz: 5900, highKHz: 18000 }, ifKHz: 455 }));
    const [, middle] = high.trackingPointsKHz;
    const check = high.steps.find((s) => /Confirm the oscillator side/.test(s.text))?.text ?? "";
    expect(check).toMatch(/two IFs \(910 kHz\) below the mark/);
    expect(middle - 910).toBeLessThan(10000);
    expect(check).toContain(`near ${middle - 910} kHz`);
    expect(check).not.toMatch(/weakly|strong/);
    const low = planAlignment(checkAlignmentBasis({ band: { lowKHz: 5900, highKHz: 18000 }, ifKHz: 455, injection: "low" }));
    expect(low.steps.find((s) => /Confirm the oscillator side/.test(s.text))?.text).toMatch(/two IFs \(910 kHz\) above the mark/);
  });

  test("the kind comes from the band: 1.6–4.5 MHz is SW and gets the image check", () => {
    const plan = planAlignment(checkAlignmentBasis({ band: { lowKHz: 1600, highKHz: 4500 }, ifKHz: 455 }));
    expect(plan.bandKind).toBe("SW");
    expect(plan.steps.some((s) => /Confirm the oscillator side/.test(s.text))).toBe(true);
  });

  test("FM: IF at 10.7 MHz and the detector before the RF alignment", () => {
    const plan = planAlignment(checkAlignmentBasis({ band: { lowKHz: 88000, highKHz: 108000, kind: "FM" }, ifKHz: 10700 }));
    const texts = plan.steps.map((s) => s.text);
    expect(texts.findIndex((t) => /10\.7 MHz/.test(t) && /^IF first/.test(t))).toBeLessThan(texts.findIndex((t) => /^Low point/.test(t)));
    expect(texts.some((t) => /ratio detector or discriminator/.test(t))).toBe(true);
  });

  test("hot-chassis sets start with the isolation transformer; an IF inside the band is flagged", () => {
    const plan = planAlignment({ ...checkAlignmentBasis({ band: { lowKHz: 400, highKHz: 1650 }, ifKHz: 455 }), hotChassis: true });
    expect(plan.steps[0].text).toMatch(/isolation transformer/);
    expect(plan.warnings.join(" ")).toMatch(/inside the band/);
  });
});
