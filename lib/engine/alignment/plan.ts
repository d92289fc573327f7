import type { BandKind } from "../bands/band";
import { ifFamilyOf } from "../bands/if-presets";
import { EngineError } from "../engine-error";
import { bandFrequencies, imageRejection, type BandFrequencies } from "./frequencies";
import type { DialRange, Injection } from "./inputs";
import { ruleOfThumbPoints } from "./tracking-points";

export type AlignmentStep = { order: number; text: string };

export type AlignmentPlanInput = {
  band: DialRange & { kind?: BandKind };
  ifKHz: number;
  injection?: Injection;
  trackingPointsKHz?: readonly [number, number, number] | readonly number[];
  /** Loaded Q of the signal circuit, for the image-rejection figure; omitted when unknown. */
  loadedQ?: number;
  /** Adds the isolation-transformer reminder for hot-chassis sets. */
  hotChassis?: boolean;
};

export type AlignmentPlan = BandFrequencies & {
  bandKind: BandKind;
  injection: Injection;
  trackingPointsKHz: [number, number, number];
  imageRejection?: { atLowEnd: { ratio: number; dB: number }; atHighEnd: { ratio: number; dB: number } };
  steps: AlignmentStep[];
  warnings: string[];
};

/** Without a stated kind, guess from the IF and the frequencies; a set's own band kind always wins. */
export function inferBandKind(band: DialRange, ifKHz: number): BandKind {
  if (ifFamilyOf(ifKHz) === "FM" || band.lowKHz >= 30000) return "FM";
  if (band.highKHz <= 520) return "LW";
  if (band.lowKHz >= 1700) return "SW";
  return "MW";
}

const fmt = (kHz: number) => (kHz >= 10000 ? `${trim(kHz / 1000, 3)} MHz` : `${trim(kHz, 1)} kHz`);

function trim(x: number, digits: number): string {
  return String(Number(x.toFixed(digits)));
}

export function planAlignment(input: AlignmentPlanInput): AlignmentPlan {
  const injection = input.injection ?? "high";
  const freqs = bandFrequencies(input.band, input.ifKHz, injection);
  const kind = input.band.kind ?? inferBandKind(input.band, input.ifKHz);
  const points = input.trackingPointsKHz ? checkPlanPoints(input.trackingPointsKHz, input.band) : ruleOfThumbPoints(input.band);
  const [low, middle, high] = points;
  const lo = (f: number) => (injection === "high" ? f + input.ifKHz : f - input.ifKHz);
  const side = injection === "high" ? "above" : "below";
  const texts: string[] = [];

  if (input.hotChassis) {
    texts.push(
      "Work through an isolation transformer: this set's chassis is tied to one side of the mains. Connect the generator and meters only with the set fed from the transformer.",
    );
  }
  texts.push("Let the set warm up for 15 minutes; connect an output meter across the speaker or a meter at the detector load.");
  if (kind === "FM") {
    texts.push(
      `IF first: inject ${fmt(input.ifKHz)} with a weak signal and peak each IF transformer from the last stage back to the first, reducing the input as the peak nears.`,
      `Set the ratio detector or discriminator secondary for zero output at ${fmt(input.ifKHz)}, midway between the peaks of a symmetrical S-curve.`,
      `Low point: tune to ${fmt(low)} and set the oscillator coil (spread or squeeze the turns, or turn the slug) so the signal is heard at the mark, LO ${fmt(lo(low))}; peak the RF and antenna coils.`,
      `High point: tune to ${fmt(high)} and set the oscillator trimmer so the signal is at the mark, LO ${fmt(lo(high))}; peak the RF and antenna trimmers.`,
    );
  } else {
    texts.push(
      `IF first: inject ${fmt(input.ifKHz)} at a low generator level and peak each IF transformer from the last stage back to the first; keep the detector output low and reduce the input as the peak nears.`,
    );
    if (kind === "SW") {
      texts.push(
        `Start with the oscillator trimmer at minimum capacitance and bring it up: the first response is the LO ${side} the signal, as wanted; a second response further on is the image, ${fmt(2 * input.ifKHz)} away.`,
      );
    }
    texts.push(
      `Low point: tune the dial to ${fmt(low)}, inject ${fmt(low)} and set the oscillator coil slug or padder so the signal is at the mark (LO ${fmt(lo(low))}); then peak the antenna coil.`,
      `High point: tune the dial to ${fmt(high)}, inject ${fmt(high)} and set the oscillator trimmer so the signal is at the mark (LO ${fmt(lo(high))}); then peak the antenna trimmer.`,
    );
  }
  texts.push("Repeat the low and high points until nothing changes.");
  texts.push(
    `Check the middle point at ${fmt(middle)} and the band edges at ${fmt(input.band.lowKHz)} and ${fmt(input.band.highKHz)} against the dial, and record each reading on the bench sheet.`,
  );
  if (kind === "SW") {
    texts.push(
      `Confirm the image: a generator at ${fmt(high)} should be heard only weakly with the dial at ${fmt(injection === "high" ? high - 2 * input.ifKHz : high + 2 * input.ifKHz)}; if that response is the strong one, the oscillator is on the wrong side.`,
    );
  }

  const warnings: string[] = [];
  if (input.ifKHz >= input.band.lowKHz && input.ifKHz <= input.band.highKHz) {
    warnings.push(`The IF (${fmt(input.ifKHz)}) lies inside the band; expect a dead spot or whistle near it on the dial.`);
  }
  if (kind === "MW" && injection === "low") {
    warnings.push("On MW the oscillator normally runs above the signal; a low oscillator needs a far wider capacitance ratio.");
  }

  const plan: AlignmentPlan = {
    ...freqs,
    bandKind: kind,
    injection,
    trackingPointsKHz: points,
    steps: texts.map((text, i) => ({ order: i + 1, text })),
    warnings,
  };
  if (input.loadedQ !== undefined) {
    const a = imageRejection(input.band.lowKHz, input.ifKHz, input.loadedQ, injection);
    const b = imageRejection(input.band.highKHz, input.ifKHz, input.loadedQ, injection);
    plan.imageRejection = { atLowEnd: { ratio: a.ratio, dB: a.dB }, atHighEnd: { ratio: b.ratio, dB: b.dB } };
  }
  return plan;
}

function checkPlanPoints(points: readonly number[], band: DialRange): [number, number, number] {
  if (points.length !== 3) throw new EngineError("points-count", "Give exactly 3 tracking points.", "trackingPointsKHz");
  points.forEach((p, i) => {
    if (!Number.isFinite(p) || p < band.lowKHz || p > band.highKHz) {
      throw new EngineError("point-outside-band", "Tracking points must lie on the band.", `trackingPointsKHz.${i}`);
    }
  });
  const sorted = [...points].sort((a, b) => a - b);
  return [sorted[0], sorted[1], sorted[2]];
}
