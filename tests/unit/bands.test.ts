import fc from "fast-check";
import { describe, expect, test } from "vitest";
import {
  amAllocations,
  countCarriers,
  dialPresetsFor,
  fmChannelKHz,
  fmChannelNumber,
  hfBroadcastBands,
  hfBroadcastBandsFor,
  ifFamilyOf,
  ifPresets,
  isCarrier,
  isPlausibleIf,
  listCarriers,
  metreBandLabel,
  metreBandsCovered,
  nearestCarrier,
  plausibleIfRangeKHz,
  rasters,
  wavelengthMetres,
  bandKindForRange,
  parseFrequencyText,
} from "@/lib/engine/bands";
import { EngineError } from "@/lib/engine/engine-error";
import { evaluate } from "./support/oracles";

describe("AM allocations and rasters", () => {
  test("US AM broadcast band is 535–1705 kHz (published: 47 CFR §73.14)", () => {
    expect(amAllocations["us-am"]).toMatchObject({ lowKHz: 535, highKHz: 1705 });
  });

  test("US AM carriers 540–1700 kHz on 10 kHz: 117 carriers; 1030 valid, 1035, 530 and 1710 not (published: 47 CFR §73.14)", () => {
    const r = rasters["mw-region-2"];
    expect(countCarriers(r)).toBe(117);
    expect(listCarriers(r)).toHaveLength(117);
    expect(isCarrier(1030, r)).toBe(true);
    expect(isCarrier(1035, r)).toBe(false);
    expect(isCarrier(530, r)).toBe(false);
    expect(isCarrier(1710, r)).toBe(false);
    expect(isCarrier(540, r)).toBe(true);
    expect(isCarrier(1700, r)).toBe(true);
  });

  test("older US dials print about 540–1600 kHz (from memory)", () => {
    const older = dialPresetsFor(2).find((p) => p.id === "mw-older");
    expect(older?.band).toMatchObject({ kind: "MW", lowKHz: 540, highKHz: 1600 });
  });

  test("Regions 1 and 3: 526.5–1606.5 kHz, carriers 531 + 9n to 1602: 120; 999 valid, 1000 not (published: ITU RR Art. 5; Geneva 1975 plan)", () => {
    expect(amAllocations["mw-region-1-3"]).toMatchObject({ lowKHz: 526.5, highKHz: 1606.5 });
    const r = rasters["mw-region-1-3"];
    expect(countCarriers(r)).toBe(120);
    expect(isCarrier(999, r)).toBe(true);
    expect(isCarrier(1000, r)).toBe(false);
    expect(isCarrier(1602, r)).toBe(true);
    expect(isCarrier(1611, r)).toBe(false);
  });

  test("Region 2: 535–1605 kHz broadcasting, 1605–1705 kHz per the 1988 Rio plan (published: ITU RR 5.89)", () => {
    expect(amAllocations["mw-region-2"]).toMatchObject({ lowKHz: 535, highKHz: 1605 });
    expect(amAllocations["mw-region-2-extended"]).toMatchObject({ lowKHz: 1605, highKHz: 1705 });
  });

  test("LW Region 1: 148.5–283.5 kHz, carriers 153–279 kHz on 9 kHz: 15 (from memory, RR Art. 5)", () => {
    expect(amAllocations["lw-region-1"]).toMatchObject({ lowKHz: 148.5, highKHz: 283.5 });
    expect(countCarriers(rasters["lw-region-1"])).toBe(15);
    expect(listCarriers(rasters["lw-region-1"]).at(-1)).toBe(279);
  });

  test("nearest carrier snaps to the raster and clamps at its ends", () => {
    expect(nearestCarrier(1034, rasters["mw-region-2"])).toBe(1030);
    expect(nearestCarrier(1036, rasters["mw-region-2"])).toBe(1040);
    expect(nearestCarrier(100, rasters["mw-region-2"])).toBe(540);
    expect(nearestCarrier(5000, rasters["mw-region-1-3"])).toBe(1602);
  });

  test("US clear-channel frequencies are carriers; the odd-5 kHz frequencies between them are not (from memory: 47 CFR §73.25 clear channels)", () => {
    const r = rasters["mw-region-2"];
    for (const f of [
      640, 650, 660, 670, 700, 720, 750, 760, 770, 780, 820, 830, 840, 850, 870, 880, 890, 1020, 1030, 1040, 1100, 1110, 1120, 1160, 1180,
      1200, 1210, 1500, 1510,
    ]) {
      expect(isCarrier(f, r)).toBe(true);
      expect(isCarrier(f + 5, r)).toBe(false);
    }
  });

  test("Region 1 MW stations on 9 kHz channels: 693, 909, 1089, 1215 kHz are carriers; 1000 and 1010 are not (from memory: UK national MW frequencies)", () => {
    const r = rasters["mw-region-1-3"];
    for (const f of [693, 909, 1089, 1215]) expect(isCarrier(f, r)).toBe(true);
    for (const f of [1000, 1010, 694]) expect(isCarrier(f, r)).toBe(false);
  });

  test("property: the nearest carrier is a carrier, within half a step, for any frequency on the dial", () => {
    for (const r of [rasters["mw-region-2"], rasters["mw-region-1-3"], rasters["fm-us"]]) {
      fc.assert(
        fc.property(fc.double({ min: r.firstKHz, max: r.lastKHz, noNaN: true }), (f) => {
          const c = nearestCarrier(f, r);
          expect(isCarrier(c, r)).toBe(true);
          expect(Math.abs(c - f)).toBeLessThanOrEqual(r.stepKHz / 2 + 1e-9);
        }),
      );
    }
  });

  test("property: non-integer and non-finite frequencies are never carriers", () => {
    fc.assert(
      fc.property(fc.double({ noInteger: true }), (f) => {
        expect(isCarrier(f, rasters["mw-region-2"])).toBe(false);
      }),
    );
  });
});

describe("HF broadcast bands", () => {
  test("metre bands in kHz (published: ITU RR 5.134 and Art. 5; 13 m and 11 m from memory)", () => {
    const byLabel = Object.fromEntries(hfBroadcastBands.map((b) => [b.label, [b.lowKHz, b.highKHz]]));
    expect(byLabel).toEqual({
      "49 m": [5900, 6200],
      "41 m": [7200, 7450],
      "31 m": [9400, 9900],
      "25 m": [11600, 12100],
      "22 m": [13570, 13870],
      "19 m": [15100, 15800],
      "16 m": [17480, 17900],
      "15 m": [18900, 19020],
      // from memory:
      "13 m": [21450, 21850],
      "11 m": [25670, 26100],
    });
  });

  test("41 m in Region 2 is 7300–7400 kHz (published: ITU RR Art. 5)", () => {
    expect(hfBroadcastBandsFor(2).find((b) => b.metres === 41)).toMatchObject({ lowKHz: 7300, highKHz: 7400 });
    expect(hfBroadcastBandsFor(1).find((b) => b.metres === 41)).toMatchObject({ lowKHz: 7200, highKHz: 7450 });
  });

  test("λ = 299 792.458 / f: 5950 kHz → 50.4 m, 9500 kHz → 31.6 m (computed; oracle: mathjs speedOfLight with units)", () => {
    const oracle = (kHz: number) => evaluate(`speedOfLight / (${kHz} kHz)`).toNumber("m") as number;
    expect(wavelengthMetres(5950)).toBeCloseTo(50.4, 1);
    expect(wavelengthMetres(9500)).toBeCloseTo(31.6, 1);
    expect(wavelengthMetres(5950)).toBeCloseTo(oracle(5950), 9);
    expect(wavelengthMetres(9500)).toBeCloseTo(oracle(9500), 9);
  });

  test("metre-band label from frequency", () => {
    expect(metreBandLabel(5950)).toBe("49 m");
    expect(metreBandLabel(9500)).toBe("31 m");
    expect(metreBandLabel(7250, 2)).toBeNull();
    expect(metreBandLabel(7250, 1)).toBe("41 m");
    expect(metreBandLabel(8000)).toBeNull();
    expect(metreBandsCovered(5900, 9900)).toEqual(["49 m", "41 m", "31 m"]);
    expect(() => metreBandLabel(0)).toThrow(EngineError);
    expect(() => wavelengthMetres(Number.NaN)).toThrow(EngineError);
  });
});

describe("FM", () => {
  test("US FM 88–108 MHz, channel n at 88.1 + 0.2(n − 201) MHz: 201 = 88.1, 250 = 97.9, 300 = 107.9 (published: 47 CFR §73.201)", () => {
    expect(fmChannelKHz(201)).toBe(88100);
    expect(fmChannelKHz(250)).toBe(97900);
    expect(fmChannelKHz(300)).toBe(107900);
    expect(countCarriers(rasters["fm-us"])).toBe(100);
    expect(dialPresetsFor(2).find((p) => p.id === "fm")?.band).toMatchObject({ lowKHz: 88000, highKHz: 108000 });
    expect(() => fmChannelKHz(200)).toThrow(EngineError);
    expect(() => fmChannelKHz(301)).toThrow(EngineError);
  });

  test("Region 1 FM is 87.5–108 MHz (from memory)", () => {
    expect(dialPresetsFor(1).find((p) => p.id === "fm")?.band).toMatchObject({ lowKHz: 87500, highKHz: 108000 });
  });

  test("property: FM channel numbers round-trip and off-raster frequencies have none", () => {
    fc.assert(
      fc.property(fc.integer({ min: 201, max: 300 }), (n) => {
        expect(fmChannelNumber(fmChannelKHz(n))).toBe(n);
        expect(fmChannelNumber(fmChannelKHz(n) + 100)).toBeNull();
      }),
    );
  });
});

describe("IF presets", () => {
  const kHzOf = ifPresets.map((p) => p.kHz);

  test("455 kHz is the US standard after about 1940 (published: secondary histories of the IF standard)", () => {
    expect(ifPresets[0]).toMatchObject({ kHz: 455, family: "AM" });
  });

  test("earlier US IFs 175, 262, 456 and 465 kHz (published: period service notes; secondary)", () => {
    expect(kHzOf).toEqual(expect.arrayContaining([175, 262, 456, 465]));
  });

  test("European IFs 452, 460, 465, 468, 470 kHz, and 447 kHz in some Danish sets (secondary)", () => {
    expect(kHzOf).toEqual(expect.arrayContaining([452, 460, 465, 468, 470, 447]));
  });

  test("FM IF 10.7 MHz, ceramic filter groups 10.60–10.80 MHz (published: service-manual FM alignment charts)", () => {
    expect(ifPresets.find((p) => p.family === "FM")?.kHz).toBe(10700);
    expect(plausibleIfRangeKHz.FM).toEqual({ min: 10600, max: 10800 });
  });

  test("plausible input ranges AM 100–600 kHz, FM 10.6–10.8 MHz (common practice)", () => {
    expect(plausibleIfRangeKHz.AM).toEqual({ min: 100, max: 600 });
    expect(isPlausibleIf(455, "AM")).toBe(true);
    expect(isPlausibleIf(99, "AM")).toBe(false);
    expect(isPlausibleIf(601, "AM")).toBe(false);
    expect(isPlausibleIf(10.7, "FM")).toBe(false);
    expect(ifFamilyOf(10700)).toBe("FM");
    expect(ifFamilyOf(4550)).toBeNull();
    for (const p of ifPresets) expect(isPlausibleIf(p.kHz, p.family)).toBe(true);
  });
});

describe("band kinds", () => {
  // Plausible printed dial ranges (REFERENCES.md, bands and rasters): LW ends by 520 kHz, MW runs to 1800 kHz,
  // SW from 1.5 MHz, FM from 64 MHz; the IF plays no part in the kind.
  test("the kind comes from the dial range: 540–1600 kHz MW, 1.6–4.5 MHz SW, 150–285 kHz LW, 88–108 MHz FM", () => {
    expect(bandKindForRange({ lowKHz: 540, highKHz: 1600 })).toBe("MW");
    expect(bandKindForRange({ lowKHz: 1600, highKHz: 4500 })).toBe("SW");
    expect(bandKindForRange({ lowKHz: 150, highKHz: 285 })).toBe("LW");
    expect(bandKindForRange({ lowKHz: 88000, highKHz: 108000 })).toBe("FM");
  });

  test("frequency text: units convert to kHz (definitions: 1 MHz = 1000 kHz)", () => {
    expect(parseFrequencyText("1.49 MHz")).toBe(1490);
    expect(parseFrequencyText("455 kHz")).toBe(455);
    expect(parseFrequencyText("455k")).toBe(455);
    expect(parseFrequencyText("10.7M")).toBe(10700);
    expect(parseFrequencyText("98.1", "MHz")).toBe(98100);
    expect(parseFrequencyText("")).toBeNull();
    expect(parseFrequencyText("4 5 5")).toBeUndefined();
  });
});
