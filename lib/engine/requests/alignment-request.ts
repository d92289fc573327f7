import { z } from "zod";
import { bandKindSchema, injectionSchema } from "../bands/band";
import { ifFamilyOf, plausibleIfRangeKHz } from "../bands/if-presets";
import { EngineError } from "../engine-error";
import { solveMinimaxPoints } from "../alignment/minimax";
import { planAlignment, type AlignmentStep } from "../alignment/plan";
import { compareTwoPointDesigns, solveTracking } from "../alignment/solve-tracking";
import { sampleErrorCurve, type ErrorPoint } from "../alignment/tracking";

/*
 * POST /api/tools/alignment. Frequencies in kHz (FM too), capacitance in pF, inductance in µH.
 *
 *   request:  { "band": { "lowKHz": 540, "highKHz": 1600 }, "ifKHz": 455,
 *               "gang": { "minPF": 10, "maxPF": 365 }, "trackingPointsKHz": [600, 1000, 1400] }
 *   response: { "lo": { "lowKHz": 995, "highKHz": 2055 }, "image": { "lowKHz": 1450, "highKHz": 2510 },
 *               "capacitanceRatio": { "signal": 8.779, "oscillator": 4.266 },
 *               "trackingPointsKHz": [600, 1000, 1400], "steps": [{ "order": 1, "text": "…" }, …],
 *               "design": { "signalInductanceUH": 216.82, "signalFixedPF": 45.63, "padderPF": 413.25,
 *                           "oscillatorFixedPF": 55.99, "oscillatorInductanceUH": 123.03,
 *                           "maxAbsErrorKHz": 11.66, "errorCurve": [{ "kHz": 540, "errorKHz": … }, …],
 *                           "minimax": { "trackingPointsKHz": [596.7, 1010.5, 1513.5], "maxAbsErrorKHz": 4.68, … },
 *                           "comparisons": [{ "method": "padder-only", … }, { "method": "trimmer-only", … }] } }
 *
 * Without trackingPointsKHz the rule-of-thumb points are used; design is present whenever gang is.
 */
const kHz = z.number({ error: "Enter a frequency in kHz." }).positive().max(1_000_000);

export const alignmentRequestSchema = z
  .object({
    band: z.object({ lowKHz: kHz, highKHz: kHz, kind: bandKindSchema.optional() }),
    ifKHz: kHz.refine((v) => ifFamilyOf(v) !== null, {
      message: `The IF lies in ${plausibleIfRangeKHz.AM.min}–${plausibleIfRangeKHz.AM.max} kHz (AM) or ${plausibleIfRangeKHz.FM.min}–${plausibleIfRangeKHz.FM.max} kHz (FM).`,
    }),
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
  })
  .superRefine((r, ctx) => {
    if (r.band.lowKHz >= r.band.highKHz) {
      ctx.addIssue({ code: "custom", path: ["band", "highKHz"], message: "The high end must be above the low end." });
    }
    if (r.gang && r.gang.maxPF <= r.gang.minPF) {
      ctx.addIssue({ code: "custom", path: ["gang", "maxPF"], message: "The gang maximum must be above its minimum." });
    }
    r.trackingPointsKHz?.forEach((p, i) => {
      if (p < r.band.lowKHz || p > r.band.highKHz) {
        ctx.addIssue({ code: "custom", path: ["trackingPointsKHz", i], message: "Tracking points must lie on the band." });
      }
    });
  });

export type AlignmentRequest = z.infer<typeof alignmentRequestSchema>;

export type AlignmentDesign = {
  signalInductanceUH: number;
  signalFixedPF: number;
  signalTrimmerPF: number;
  padderPF: number;
  oscillatorFixedPF: number;
  oscillatorTrimmerPF: number;
  oscillatorInductanceUH: number;
  maxAbsErrorKHz: number;
  errorCurve: ErrorPoint[];
  minimax: { trackingPointsKHz: [number, number, number]; maxAbsErrorKHz: number; errorCurve: ErrorPoint[] } | null;
  comparisons: (
    | {
        method: "padder-only" | "trimmer-only";
        ok: true;
        padderPF: number | null;
        oscillatorFixedPF: number;
        oscillatorInductanceUH: number;
        maxAbsErrorKHz: number;
        errorCurve: ErrorPoint[];
      }
    | { method: "padder-only" | "trimmer-only"; ok: false; reason: string }
  )[];
};

export type AlignmentResponse = {
  bandKind: string;
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

/**
 * The alignment calculator. Throws EngineError (with the request's field path) when the gang cannot
 * cover the band or the points cannot be tracked; invalidInputBody turns that into the 400 body.
 */
export function runAlignmentTool(input: AlignmentRequest): AlignmentResponse {
  const plan = planAlignment({
    band: input.band,
    ifKHz: input.ifKHz,
    injection: input.injection,
    trackingPointsKHz: input.trackingPointsKHz,
    loadedQ: input.loadedQ,
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
  if (!input.gang) return response;

  const base = { band: input.band, ifKHz: input.ifKHz, injection: input.injection, gang: input.gang };
  const samples = input.samples ?? 101;
  const solution = solveTracking({ ...base, trackingPointsKHz: plan.trackingPointsKHz, samples });
  let minimax: AlignmentDesign["minimax"] = null;
  try {
    const m = solveMinimaxPoints(base);
    const [a, b, c] = m.design.trackingPointsKHz;
    minimax = { trackingPointsKHz: [a, b, c], maxAbsErrorKHz: m.maxAbsErrorKHz, errorCurve: sampleErrorCurve(m.design, samples) };
  } catch (e) {
    // The chosen points track; only the search for better ones found nothing, which is worth no 400.
    if (!(e instanceof EngineError)) throw e;
  }
  response.design = {
    signalInductanceUH: solution.signalInductanceUH,
    signalFixedPF: solution.signalFixedPF,
    signalTrimmerPF: solution.signalTrimmerPF,
    padderPF: solution.padderPF,
    oscillatorFixedPF: solution.oscillatorFixedPF,
    oscillatorTrimmerPF: solution.oscillatorTrimmerPF,
    oscillatorInductanceUH: solution.oscillatorInductanceUH,
    maxAbsErrorKHz: solution.maxAbsErrorKHz,
    errorCurve: solution.errorCurve,
    minimax,
    comparisons: compareTwoPointDesigns(base, samples).map((c) =>
      c.ok
        ? {
            method: c.method,
            ok: true as const,
            padderPF: c.design.oscillator.padderPF,
            oscillatorFixedPF: c.design.oscillator.fixedPF,
            oscillatorInductanceUH: c.design.oscillator.inductanceUH,
            maxAbsErrorKHz: c.maxAbsErrorKHz,
            errorCurve: c.errorCurve,
          }
        : c,
    ),
  };
  return response;
}
