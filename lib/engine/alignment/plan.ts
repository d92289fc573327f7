import type { BandKind } from "../bands/band";
import { bandFrequencies, imageRejection, type BandFrequencies } from "./frequencies";
import type { AlignmentBasis, Injection } from "./inputs";
import { ruleOfThumbPoints } from "./tracking-points";

export type AlignmentStep = { order: number; text: string };

export type AlignmentPlanInput = AlignmentBasis & {
  /** Checked tracking points, low to high (the request's or the service manual's); the usual ones otherwise. */
  trackingPointsKHz?: readonly [number, number, number];
  /** Loaded Q of the signal circuit, for the image-rejection figure; omitted when unknown. */
  loadedQ?: number;
  /** Adds the isolation-transformer caution for hot-chassis (AC/DC) sets. */
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

const fmt = (kHz: number) => (kHz >= 10000 ? `${trim(kHz / 1000, 3)} MHz` : `${trim(kHz, 1)} kHz`);

function trim(x: number, digits: number): string {
  return String(Number(x.toFixed(digits)));
}

/** The plan for one checked band: LO, image, capacitance ratios and the order of adjustments. */
export function planAlignment(input: AlignmentPlanInput): AlignmentPlan {
  const injection = input.injection;
  const freqs = bandFrequencies(input);
  const kind = input.band.kind;
  const points: [number, number, number] = input.trackingPointsKHz ? [...input.trackingPointsKHz] : ruleOfThumbPoints(input.band);
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
      // More trimmer capacitance lowers the LO, so from minimum the first response met is the LO above the signal.
      texts.push(
        injection === "high"
          ? `Start with the oscillator trimmer at minimum capacitance and bring it up: the first response met is the LO above the signal, the wanted one; a second response further on is the image setting, with the LO ${fmt(2 * input.ifKHz)} lower. Stop at the first.`
          : `Start with the oscillator trimmer at minimum capacitance and bring it up: the first response met is the LO above the signal, which this set does not use; go on to the second response, ${fmt(2 * input.ifKHz)} lower in LO, which is the wanted one with the LO below the signal.`,
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
    // Which side of the mark the image lies on tells the oscillator side; its strength says nothing about it.
    const twoIf = 2 * input.ifKHz;
    const right = injection === "high" ? middle - twoIf : middle + twoIf;
    const wrong = injection === "high" ? middle + twoIf : middle - twoIf;
    texts.push(
      `Confirm the oscillator side: leave the generator at ${fmt(middle)}, heard at its mark, and tune the dial for the second (image) response. With the LO ${side} the signal it lies two IFs (${fmt(twoIf)}) ${injection === "high" ? "below" : "above"} the mark, near ${fmt(right)}. If it lies ${fmt(twoIf)} ${injection === "high" ? "above" : "below"} the mark instead, near ${fmt(wrong)}, the oscillator trimmer was set on the wrong response: go back to the high point.`,
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
