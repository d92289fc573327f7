import { z } from "../zod";
import { bandKindSchema, injectionSchema } from "../bands/band";
import { ifFamilyOf, plausibleIfRangeKHz } from "../bands/if-presets";
import { fitDial, type DialFitResult } from "../alignment/dial-fit";
import { checkBand } from "../alignment/inputs";
import { describeTolerance } from "../verdicts/judge-reading";
import type { ToleranceSettings } from "../verdicts/tolerances";

/*
 * POST /api/tools/dial-fit. Frequencies in kHz (FM too), capacitance in pF, inductance in µH.
 *
 *   request:  { "band": { "lowKHz": 540, "highKHz": 1600 }, "ifKHz": 455,
 *               "gang": { "minPF": 10, "maxPF": 365 }, "trackingPointsKHz": [600, 1000, 1400],
 *               "readings": [{ "dialKHz": 600, "receivedKHz": 588 }, { "dialKHz": 1000, "receivedKHz": 996.3 },
 *                            { "dialKHz": 1400, "loKHz": 1874.6 }] }
 *   response: { "fit": { "inductanceErrorPct": 3.0, "parallelErrorPF": -4.0, "residualKHz": 0.02 },
 *               "before": [{ "dialKHz": 600, "receivedKHz": 588, "errorKHz": -12, "verdict": "fail" }, …],
 *               "after": [{ "dialKHz": 600, "receivedKHz": 600, "errorKHz": 0 }, …],
 *               "steps": [{ "order": 1, "adjust": "coil", "direction": "decrease", "amount": 3.69, "unit": "µH", "text": "…" },
 *                         { "order": 2, "adjust": "trimmer", "direction": "increase", "amount": 4.0, "unit": "pF", "text": "…" }],
 *               "gang": { "minPF": 10, "maxPF": 365, "strayPF": 0, "source": "given" }, "inTolerance": false, … }
 *
 * Each reading carries the received frequency or the LO read on a counter. Without a gang the band kind's
 * usual gang is assumed and named in the answer (gang.source "default").
 */
const kHz = z.number({ error: "Enter a frequency in kHz." }).positive("A frequency must be greater than zero.").max(1_000_000);

export const dialFitRequestSchema = z
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
    lowEndAdjuster: z.enum(["coil", "padder"], { error: 'The low-end adjuster is "coil" or "padder".' }).optional(),
    readings: z
      .array(z.object({ dialKHz: kHz, receivedKHz: kHz.optional(), loKHz: kHz.optional() }), { error: "Give the readings as a list." })
      .min(2, "Give readings at two or more dial marks.")
      .max(50, "Give at most 50 readings."),
    resolutionKHz: z.number().positive().max(1000).optional(),
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
    r.readings.forEach((x, i) => {
      if (x.dialKHz < r.band.lowKHz || x.dialKHz > r.band.highKHz) {
        ctx.addIssue({ code: "custom", path: ["readings", i, "dialKHz"], message: "The mark must lie on the band." });
      }
      if ((x.receivedKHz === undefined) === (x.loKHz === undefined)) {
        ctx.addIssue({
          code: "custom",
          path: ["readings", i, x.receivedKHz === undefined ? "receivedKHz" : "loKHz"],
          message: "Give either the received frequency or the LO, not both.",
        });
      }
    });
    if (new Set(r.readings.map((x) => x.dialKHz)).size < 2) {
      ctx.addIssue({ code: "custom", path: ["readings"], message: "Give readings at two or more different dial marks." });
    }
  });

export type DialFitRequest = z.infer<typeof dialFitRequestSchema>;

export type DialFitResponse = Omit<DialFitResult, "fit"> & {
  fit: { inductanceErrorPct: number; parallelErrorPF: number; residualKHz: number };
  toleranceText: string;
};

/**
 * The dial fit with the shop's dial window for the band kind. Throws EngineError (with the request's field
 * path) for readings it cannot use; invalidInputBody turns that into the 400 body.
 */
export function runDialFitTool(input: DialFitRequest, tolerances?: ToleranceSettings): DialFitResponse {
  const kind = checkBand(input.band).kind;
  const tolerance = tolerances?.byBandKind[kind].dial;
  const r = fitDial({ ...input, ...(tolerance ? { tolerance } : {}) });
  const { iterations: _iterations, ...fit } = r.fit;
  return {
    ...r,
    fit,
    toleranceText: describeTolerance({ kind: "window", reference: "mark", ...r.tolerance }),
  };
}
