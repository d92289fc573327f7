import { z } from "../zod";
import { ruleOfThumbPoints } from "../alignment/tracking-points";
import { isTubeSet, type SetKind, type SetProfile } from "../checklist/profile";
import { bandName } from "../verdicts/required-readings";
import { formatNumber, type ReadingRequirement, type ReadingUnit } from "../verdicts/judge-reading";
import { performanceTolerance, performanceToleranceText, type PerformanceDirection } from "./judge";

/**
 * Performance reading keys, stored beside the alignment readings under their own prefix:
 *
 *   perf.band.<i>.sens.<low|mid|high>  input for the reference output near the low, middle and high end of band i, µV
 *   perf.snr                           signal-to-noise at the stated input, dB
 *   perf.avc                           AVC figure: output change over the stated input change, dB
 *   perf.max-output                    maximum output at the stated distortion, mW
 *   perf.hum                           hum, dB below the reference output
 *   perf.idle-current                  transistor sets: no-signal current at the nominal battery voltage, mA
 *   perf.output-bias                   transistor sets: output-stage bias, mV
 *   perf.tube.<n>                      tube sets: tube n on the tester, on the tester's scale
 */
export const performanceKey = {
  sensitivity: (band: number, end: "low" | "mid" | "high") => `perf.band.${band}.sens.${end}`,
  snr: "perf.snr",
  avc: "perf.avc",
  maxOutput: "perf.max-output",
  hum: "perf.hum",
  idleCurrent: "perf.idle-current",
  outputBias: "perf.output-bias",
  tube: (n: number) => `perf.tube.${n}`,
} as const;

export const isPerformanceKey = (key: string): boolean => key.startsWith("perf.");

const positive = (what: string, max: number) =>
  z
    .number({ error: `${what}: enter a number.` })
    .positive(`${what}: more than 0.`)
    .max(max, `${what}: at most ${max}.`);

/** The conditions the readings are taken under, printed with them. Defaults are the usual AM broadcast ones. */
export const performanceConditionsSchema = z.object({
  referenceOutputMW: positive("Reference output (mW)", 10_000),
  loadOhms: positive("Load (Ω)", 10_000),
  modulationPercent: positive("Modulation (%)", 100),
  modulationHz: positive("Modulation frequency (Hz)", 20_000),
  snrInputUV: positive("Signal-to-noise input (µV)", 1_000_000),
  avcLowUV: positive("AVC input, low (µV)", 1_000_000),
  avcHighUV: positive("AVC input, high (µV)", 1_000_000),
  distortionPercent: positive("Distortion at maximum output (%)", 100),
  batteryVolts: positive("Nominal battery voltage (V)", 400).optional(),
});
export type PerformanceConditions = z.infer<typeof performanceConditionsSchema>;

/**
 * 50 mW into the speaker at 30 % modulation at 400 Hz is the usual reference output for AM sets (common
 * practice, from memory); 10 % distortion is the usual limit for "maximum output" of a small set; the AVC
 * figure over 10 µV to 100 mV (80 dB) and S/N at 1 mV are the shop's own starting points.
 */
export const defaultPerformanceConditions: PerformanceConditions = {
  referenceOutputMW: 50,
  loadOhms: 8,
  modulationPercent: 30,
  modulationHz: 400,
  snrInputUV: 1000,
  avcLowUV: 10,
  avcHighUV: 100_000,
  distortionPercent: 10,
};

/** A job's performance setup: whether the technician opted in, the conditions, the service figures entered. */
export const performanceSetupSchema = z.object({
  enabled: z.boolean(),
  conditions: performanceConditionsSchema,
  /** Service figure by reading key; a reading without one is recorded, not judged. */
  figures: z.record(z.string().max(60), z.number().finite().nonnegative()),
});
export type PerformanceSetup = z.infer<typeof performanceSetupSchema>;

export const defaultPerformanceSetup: PerformanceSetup = { enabled: false, conditions: defaultPerformanceConditions, figures: {} };

export type PerformanceRequirement = ReadingRequirement & {
  direction: PerformanceDirection;
  /** The entered figure, or null: the reading is then recorded only. */
  figure: number | null;
  /** Where the figure comes from, printed beside it. */
  figureSource: string;
};

const fmtKHz = (kHz: number) => (kHz >= 10000 ? `${formatNumber(kHz / 1000)} MHz` : `${formatNumber(kHz)} kHz`);
const fmtUV = (uV: number) => (uV >= 1000 ? `${formatNumber(uV / 1000)} mV` : `${formatNumber(uV)} µV`);

/** The tubes a tube set lists for testing when its profile gives no count (a five-tube superhet). */
export const USUAL_TUBE_COUNT = 5;

/**
 * The performance readings the checklist offers for this set kind, with each one's tolerance from the
 * entered figure. Empty when the technician has not opted in: they are never asked for otherwise.
 */
export function listPerformanceReadings(
  profile: Pick<SetProfile, "kind" | "bands" | "tubes">,
  setup: PerformanceSetup,
): PerformanceRequirement[] {
  if (!setup.enabled) return [];
  const c = setup.conditions;
  const out: PerformanceRequirement[] = [];
  const ref = `${formatNumber(c.referenceOutputMW)} mW into ${formatNumber(c.loadOhms)} ohms`;
  const mod = `${formatNumber(c.modulationPercent)} % at ${formatNumber(c.modulationHz)} Hz`;
  const push = (
    r: { key: string; label: string; lineCode: string; unit: ReadingUnit; direction: PerformanceDirection },
    source = "the set's service figure",
  ) => {
    const raw = setup.figures[r.key];
    const figure = typeof raw === "number" && Number.isFinite(raw) ? raw : null;
    const tolerance = performanceTolerance(r.direction, figure, r.unit);
    out.push({
      ...r,
      measures: "performance",
      nominal: tolerance.kind === "percent" ? figure : null,
      tolerance,
      toleranceText: performanceToleranceText(tolerance, source),
      figure,
      figureSource: source,
    });
  };

  profile.bands.forEach((band, i) => {
    // Near the low, middle and high end: the band's tracking points, where the set is meant to be best.
    const points = band.trackingPointsKHz ?? ruleOfThumbPoints(band);
    const am = band.kind !== "FM";
    (["low", "mid", "high"] as const).forEach((end, k) =>
      push({
        key: performanceKey.sensitivity(i, end),
        label: `${bandName(band, i)}: sensitivity at ${fmtKHz(points[k])}, input for ${ref}${am ? ` at ${mod}` : ""}`,
        lineCode: `perf.sensitivity.${i}`,
        unit: "µV",
        direction: "lower",
      }),
    );
  });
  push({
    key: performanceKey.snr,
    label: `Signal-to-noise at ${fmtUV(c.snrInputUV)} input`,
    lineCode: "perf.audio",
    unit: "dB",
    direction: "higher",
  });
  push({
    key: performanceKey.avc,
    label: `AVC: output change for an input change from ${fmtUV(c.avcLowUV)} to ${fmtUV(c.avcHighUV)}`,
    lineCode: "perf.audio",
    unit: "dB",
    direction: "lower",
  });
  push({
    key: performanceKey.maxOutput,
    label: `Maximum output at ${formatNumber(c.distortionPercent)} % distortion, into ${formatNumber(c.loadOhms)} ohms`,
    lineCode: "perf.audio",
    unit: "mW",
    direction: "higher",
  });
  push({
    key: performanceKey.hum,
    label: `Hum, below the reference output (${ref})`,
    lineCode: "perf.audio",
    unit: "dB",
    direction: "higher",
  });

  if (isTransistorSet(profile.kind)) {
    push({
      key: performanceKey.idleCurrent,
      label: `Idle current, no signal${c.batteryVolts ? ` at ${formatNumber(c.batteryVolts)} V` : " at the nominal battery voltage"}`,
      lineCode: "perf.transistor",
      unit: "mA",
      direction: "lower",
    });
    push({ key: performanceKey.outputBias, label: "Output-stage bias", lineCode: "perf.transistor", unit: "mV", direction: "near" });
  }
  if (isTubeSet(profile.kind)) {
    const count = profile.tubes && profile.tubes > 0 ? profile.tubes : USUAL_TUBE_COUNT;
    for (let n = 1; n <= count; n++) {
      push(
        { key: performanceKey.tube(n), label: `Tube ${n} on the tester`, lineCode: "perf.tubes", unit: "scale", direction: "higher" },
        "the tester's minimum",
      );
    }
  }
  return out;
}

function isTransistorSet(kind: SetKind): boolean {
  return kind === "transistor-battery" || kind === "transistor-mains";
}
