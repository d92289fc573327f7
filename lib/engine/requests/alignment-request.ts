import { z } from "../zod";
import { bandKindSchema, injectionSchema, type BandKind } from "../bands/band";
import { parseFrequencyText } from "../bands/frequency-text";
import { EngineError } from "../engine-error";
import {
  alignmentBasis,
  checkBand,
  checkGang,
  checkIf,
  checkIfForBand,
  checkTrackingPoints,
  type AlignmentBasis,
  type CheckedGang,
  type TrackingBasis,
} from "../alignment/inputs";
import { solveMinimaxPoints } from "../alignment/minimax";
import { planAlignment, type AlignmentStep } from "../alignment/plan";
import { compareTwoPointDesigns } from "../alignment/solve-tracking";
import {
  designSignalCircuit,
  designThreePoint,
  designTrimmerOnly,
  maxAbsErrorKHz,
  sampleErrorCurve,
  worstSensitivityLoss,
  type ErrorPoint,
  type TrackingDesign,
} from "../alignment/tracking";

/*
 * POST /api/tools/alignment. Frequencies in kHz (FM too), capacitance in pF, inductance in µH; a frequency
 * may also be sent as text with its unit ("1.49 MHz", "455 kHz", "455k").
 *
 *   request:  { "band": { "lowKHz": 540, "highKHz": 1600 }, "ifKHz": 455,
 *               "gang": { "minPF": 10, "maxPF": 365 }, "trackingPointsKHz": [600, 1000, 1400] }
 *   response: { "bandKind": "MW", "lo": { "lowKHz": 995, "highKHz": 2055 }, "image": { "lowKHz": 1450, "highKHz": 2510 },
 *               "capacitanceRatio": { "signal": 8.779, "oscillator": 4.266 },
 *               "trackingPointsKHz": [600, 1000, 1400], "steps": [{ "order": 1, "text": "…" }, …],
 *               "design": { "method": "three-point", "signalInductanceUH": 216.82, "signalFixedPF": 45.63,
 *                           "padderPF": 413.25, "oscillatorFixedPF": 55.99, "oscillatorInductanceUH": 123.03,
 *                           "maxAbsErrorKHz": 11.66, "sensitivityLossDb": 4.51, "loadedQ": 80, "loadedQAssumed": true,
 *                           "notes": [], "errorCurve": [{ "kHz": 540, "errorKHz": … }, …],
 *                           "minimax": { "trackingPointsKHz": [579.3, 916.9, 1482.0], "sensitivityLossDb": 2.24,
 *                                        "maxAbsErrorKHz": 8.19, … },
 *                           "comparisons": [{ "method": "padder-only", … }, { "method": "trimmer-only", … }] } }
 *
 * Without trackingPointsKHz the rule-of-thumb points are used; design is present whenever gang is.
 */
const toKHz = (v: unknown) => (typeof v === "string" ? (parseFrequencyText(v) ?? v) : v);
const kHz = z.preprocess(
  toKHz,
  z
    .number({ error: 'Enter a frequency: a number in kHz, or with its unit ("1.49 MHz", "455 kHz", "455k").' })
    .positive("A frequency is above zero.")
    .max(1_000_000, "A frequency up to 1,000,000 kHz (1 GHz)."),
);

/** The JSON the calculator and /api/tools/alignment take: shapes and types only; the meaning is checked below. */
export const alignmentRequestShape = z.object({
  band: z.object({ lowKHz: kHz, highKHz: kHz, kind: bandKindSchema.optional() }),
  ifKHz: kHz,
  injection: injectionSchema.optional(),
  gang: z
    .object({
      minPF: z.number().min(0).max(2000),
      maxPF: z.number().positive().max(5000),
      strayPF: z.number().min(0).max(1000).optional(),
    })
    .optional(),
  trackingPointsKHz: z.tuple([kHz, kHz, kHz]).optional(),
  loadedQ: z.number().positive().max(1000).optional(),
  samples: z.number().int().min(11).max(1001).optional(),
  /** An AC/DC set: its chassis is tied to the mains, so the plan opens with the isolation-transformer caution. */
  hotChassis: z.boolean().optional(),
});

/** A request through the engine's door: every value checked once, the band knowing its kind. */
export type AlignmentJob = {
  basis: AlignmentBasis;
  gang?: CheckedGang;
  trackingPointsKHz?: [number, number, number];
  loadedQ?: number;
  samples: number;
  hotChassis: boolean;
};

/** Runs one check, turning the engine's refusal into an issue on the request's own field. */
function attempt<T>(ctx: z.RefinementCtx, fn: () => T): T | undefined {
  try {
    return fn();
  } catch (e) {
    if (!(e instanceof EngineError)) throw e;
    ctx.addIssue({
      code: "custom",
      path: e.field ? e.field.split(".").map((p) => (/^\d+$/.test(p) ? Number(p) : p)) : [],
      message: e.message,
    });
    return undefined;
  }
}

/**
 * The engine's door for the alignment calculator. Parses once into checked values (a band that knows its
 * kind, an IF of the band's family, a gang in order, points on the band); the computations trust them.
 */
export const alignmentRequestSchema = alignmentRequestShape.transform((r, ctx): AlignmentJob => {
  // Each part checked once; a bad band still lets the IF and the gang report their own fields.
  const band = attempt(ctx, () => checkBand(r.band));
  const ifv = attempt(ctx, () => (band ? checkIfForBand(r.ifKHz, band) : checkIf(r.ifKHz)));
  const basis = band && ifv ? attempt(ctx, () => alignmentBasis(band, ifv, r.injection)) : undefined;
  const gang = r.gang ? attempt(ctx, () => checkGang(r.gang!)) : undefined;
  let points: [number, number, number] | undefined;
  if (r.trackingPointsKHz && basis) {
    const p = attempt(ctx, () => checkTrackingPoints(r.trackingPointsKHz!, basis.band));
    if (p) points = [p[0]!, p[1]!, p[2]!];
  }
  if (!basis || (r.gang && !gang) || (r.trackingPointsKHz && !points)) return z.NEVER;
  return {
    basis,
    ...(gang ? { gang } : {}),
    ...(points ? { trackingPointsKHz: points } : {}),
    ...(r.loadedQ !== undefined ? { loadedQ: r.loadedQ } : {}),
    samples: r.samples ?? 101,
    hotChassis: r.hotChassis ?? false,
  };
});

/** The request as sent (JSON); `AlignmentJob` is what the door makes of it. */
export type AlignmentRequest = z.input<typeof alignmentRequestSchema>;

/** Parses a request, throwing the schema's error (which invalidInputBody turns into the 400 body). */
export function parseAlignmentRequest(raw: unknown): AlignmentJob {
  return alignmentRequestSchema.parse(raw);
}

/**
 * Loaded Q assumed for the sensitivity-loss figure when the request gives none: a typical broadcast
 * receiver's antenna circuit (from memory; the request's loadedQ always wins).
 */
export const ASSUMED_LOADED_Q: Record<BandKind, number> = { LW: 80, MW: 80, SW: 80, FM: 25 };

type DesignFigures = {
  /** How the oscillator is tracked: a padder and three points, a trimmer and two points (FM, or what a low oscillator allows), or none. */
  method: "three-point" | "trimmer-only" | "signal-only";
  signalInductanceUH: number;
  signalFixedPF: number;
  signalTrimmerPF: number;
  /** null where the design has no padder (FM front ends, trimmer-only tracking). */
  padderPF: number | null;
  oscillatorFixedPF: number | null;
  oscillatorTrimmerPF: number | null;
  oscillatorInductanceUH: number | null;
  /** Largest tracking error in kHz: a secondary figure; what the set loses is sensitivityLossDb. */
  maxAbsErrorKHz: number | null;
  /** Worst-case loss of the antenna circuit's gain over the band at `loadedQ`, in dB. */
  sensitivityLossDb: number | null;
  /** Where on the dial the worst loss falls, kHz. */
  sensitivityLossAtKHz: number | null;
  errorCurve: ErrorPoint[];
};

export type AlignmentDesign = DesignFigures & {
  /** The loaded Q the loss is figured at, and whether it was assumed (no loadedQ in the request). */
  loadedQ: number;
  loadedQAssumed: boolean;
  /** Why part of the design could not be made, or what it leaves out. */
  notes: string[];
  /** The three points that minimise the worst-case sensitivity loss (equal relative error); null when none. */
  minimax: {
    trackingPointsKHz: [number, number, number];
    maxAbsErrorKHz: number;
    sensitivityLossDb: number;
    sensitivityLossAtKHz: number;
    errorCurve: ErrorPoint[];
  } | null;
  comparisons: (
    | {
        method: "padder-only" | "trimmer-only";
        ok: true;
        padderPF: number | null;
        oscillatorFixedPF: number;
        oscillatorInductanceUH: number;
        maxAbsErrorKHz: number;
        sensitivityLossDb: number;
        errorCurve: ErrorPoint[];
      }
    | { method: "padder-only" | "trimmer-only"; ok: false; reason: string }
  )[];
};

export type AlignmentResponse = {
  bandKind: BandKind;
  injection: "high" | "low";
  lo: { lowKHz: number; highKHz: number };
  image: { lowKHz: number; highKHz: number };
  capacitanceRatio: { signal: number; oscillator: number };
  trackingPointsKHz: [number, number, number];
  steps: AlignmentStep[];
  warnings: string[];
  imageRejection?: { atLowEnd: { ratio: number; dB: number }; atHighEnd: { ratio: number; dB: number } };
  design?: AlignmentDesign;
};

function figures(design: TrackingDesign, loadedQ: number, samples: number): DesignFigures {
  const loss = worstSensitivityLoss(design, loadedQ);
  const maxAbs = maxAbsErrorKHz(design);
  const errorCurve = sampleErrorCurve(design, samples);
  // Last guard against overflow at absurd extremes: no NaN or Infinity ever leaves the solver.
  if (!Number.isFinite(maxAbs) || !Number.isFinite(loss.dB) || !errorCurve.every((p) => Number.isFinite(p.errorKHz))) {
    throw new EngineError("tracking-unrealisable", "These inputs give no usable tracking design.", "trackingPointsKHz");
  }
  return {
    method: design.method === "three-point" ? "three-point" : "trimmer-only",
    signalInductanceUH: design.signal.inductanceUH,
    signalFixedPF: design.signal.fixedPF,
    signalTrimmerPF: design.signal.trimmerPF,
    padderPF: design.oscillator.padderPF,
    oscillatorFixedPF: design.oscillator.fixedPF,
    oscillatorTrimmerPF: design.oscillator.trimmerPF,
    oscillatorInductanceUH: design.oscillator.inductanceUH,
    maxAbsErrorKHz: maxAbs,
    sensitivityLossDb: loss.dB,
    sensitivityLossAtKHz: loss.kHz,
    errorCurve,
  };
}

function signalOnly(input: TrackingBasis): DesignFigures {
  const signal = designSignalCircuit(input.band, input.gang);
  return {
    method: "signal-only",
    signalInductanceUH: signal.inductanceUH,
    signalFixedPF: signal.fixedPF,
    signalTrimmerPF: signal.trimmerPF,
    padderPF: null,
    oscillatorFixedPF: null,
    oscillatorTrimmerPF: null,
    oscillatorInductanceUH: null,
    maxAbsErrorKHz: null,
    sensitivityLossDb: null,
    sensitivityLossAtKHz: null,
    errorCurve: [],
  };
}

const why = (e: unknown): string => {
  if (e instanceof EngineError) return e.message;
  throw e;
};

/**
 * The oscillator design a band allows. FM front ends track with the oscillator coil and a trimmer and no
 * padder: two points. A low oscillator needs a wider capacitance ratio than the signal section, which a
 * series padder cannot give: the three-point design is tried, then two points with the trimmer, then the
 * signal circuit alone, each step saying why.
 */
function designFor(input: TrackingBasis, points: [number, number, number], loadedQ: number, samples: number) {
  const notes: string[] = [];
  const twoPoint = () => figures(designTrimmerOnly({ ...input, trackingPointsKHz: [points[0], points[2]] }), loadedQ, samples);
  if (input.band.kind === "FM") {
    notes.push(
      `FM front ends use no padder: the oscillator coil sets the low point (${points[0] / 1000} MHz) and the trimmer the high point (${points[2] / 1000} MHz).`,
    );
    try {
      return { figures: twoPoint(), notes, threePoint: false };
    } catch (e) {
      notes.push(`No two-point oscillator design fits this gang: ${why(e)}`);
      return { figures: signalOnly(input), notes, threePoint: false };
    }
  }
  try {
    return { figures: figures(designThreePoint({ ...input, trackingPointsKHz: points }), loadedQ, samples), notes, threePoint: true };
  } catch (e) {
    if (input.injection !== "low") throw e;
    notes.push(`No three-point design with a padder: ${why(e)}`);
  }
  try {
    const f = twoPoint();
    notes.push("Shown instead: the oscillator tracked at the low and high points by its coil and trimmer, with no padder.");
    return { figures: f, notes, threePoint: false };
  } catch (e) {
    notes.push(`Nor with the trimmer alone: ${why(e)} Only the signal circuit is designed.`);
    return { figures: signalOnly(input), notes, threePoint: false };
  }
}

/**
 * The alignment calculator, on a request that has been through the door (parseAlignmentRequest). Throws
 * EngineError (with the request's field path) when the gang cannot cover the band or, with the oscillator
 * above the signal, the points cannot be tracked; invalidInputBody turns that into the 400 body.
 */
export function runAlignmentTool(job: AlignmentJob): AlignmentResponse {
  const plan = planAlignment({
    ...job.basis,
    ...(job.trackingPointsKHz ? { trackingPointsKHz: job.trackingPointsKHz } : {}),
    ...(job.loadedQ !== undefined ? { loadedQ: job.loadedQ } : {}),
    hotChassis: job.hotChassis,
  });
  const response: AlignmentResponse = {
    bandKind: plan.bandKind,
    injection: plan.injection,
    lo: plan.lo,
    image: plan.image,
    capacitanceRatio: plan.capacitanceRatio,
    trackingPointsKHz: plan.trackingPointsKHz,
    steps: plan.steps,
    warnings: plan.warnings,
    ...(plan.imageRejection ? { imageRejection: plan.imageRejection } : {}),
  };
  if (!job.gang) return response;

  const base: TrackingBasis = { ...job.basis, gang: job.gang };
  const samples = job.samples;
  const loadedQ = job.loadedQ ?? ASSUMED_LOADED_Q[job.basis.band.kind];
  const made = designFor(base, plan.trackingPointsKHz, loadedQ, samples);
  let minimax: AlignmentDesign["minimax"] = null;
  if (made.threePoint) {
    try {
      const m = solveMinimaxPoints(base, "detuning");
      const [a, b, c] = m.design.trackingPointsKHz;
      const loss = worstSensitivityLoss(m.design, loadedQ);
      minimax = {
        trackingPointsKHz: [a!, b!, c!],
        maxAbsErrorKHz: m.maxAbsErrorKHz,
        sensitivityLossDb: loss.dB,
        sensitivityLossAtKHz: loss.kHz,
        errorCurve: sampleErrorCurve(m.design, samples),
      };
    } catch (e) {
      // The chosen points track; only the search for better ones found nothing, which is worth no 400.
      if (!(e instanceof EngineError)) throw e;
    }
  }
  response.design = {
    ...made.figures,
    loadedQ,
    loadedQAssumed: job.loadedQ === undefined,
    notes: made.notes,
    minimax,
    comparisons:
      made.figures.method === "three-point"
        ? compareTwoPointDesigns(base, samples).map((c) =>
            c.ok
              ? {
                  method: c.method,
                  ok: true as const,
                  padderPF: c.design.oscillator.padderPF,
                  oscillatorFixedPF: c.design.oscillator.fixedPF,
                  oscillatorInductanceUH: c.design.oscillator.inductanceUH,
                  maxAbsErrorKHz: c.maxAbsErrorKHz,
                  sensitivityLossDb: worstSensitivityLoss(c.design, loadedQ).dB,
                  errorCurve: c.errorCurve,
                }
              : c,
          )
        : [],
  };
  return response;
}
