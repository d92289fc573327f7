import { z } from "../zod";
import { formatNumber } from "../verdicts/judge-reading";
import { judgeReading } from "../verdicts/judge-reading";
import { analyseDiscriminator, analysePassband, DEFAULT_LINEARITY_PERCENT, type DiscriminatorPoint, type PassbandPoint } from "../passband";
import type { PerformanceConditions, PerformanceRequirement } from "../performance/readings";
import { certificateContentSchema } from "./content";

// The certificate's performance and passband sections: blocks of their own beside the alignment readings,
// present only when the job measured them, so certificates issued without them parse and verify as before.

const readingSchema = certificateContentSchema.shape.readings.element;

export const performanceSectionSchema = z.object({
  /** The conditions in words: reference output, modulation, load, the stated inputs. */
  conditions: z.string(),
  readings: z.array(readingSchema),
});
export type PerformanceSection = z.infer<typeof performanceSectionSchema>;

const nullableKHz = z.number().nullable();

export const passbandSectionSchema = z.array(
  z.discriminatedUnion("curve", [
    z.object({
      curve: z.literal("response"),
      ifKHz: z.number(),
      method: z.enum(["sweep", "generator"]),
      points: z.array(z.object({ offsetKHz: z.number(), db: z.number() })),
      peakOffsetKHz: z.number(),
      centreKHz: nullableKHz,
      width3KHz: nullableKHz,
      width6KHz: nullableKHz,
      symmetry3KHz: nullableKHz,
      symmetry6KHz: nullableKHz,
    }),
    z.object({
      curve: z.literal("discriminator"),
      ifKHz: z.number(),
      method: z.enum(["sweep", "generator"]),
      points: z.array(z.object({ offsetKHz: z.number(), volts: z.number() })),
      zeroCrossingKHz: z.number(),
      linearLowKHz: z.number(),
      linearHighKHz: z.number(),
      linearityPercent: z.number(),
    }),
  ]),
);
export type PassbandSection = z.infer<typeof passbandSectionSchema>;

export function describeConditions(c: PerformanceConditions): string {
  return [
    `Reference output ${formatNumber(c.referenceOutputMW)} mW into ${formatNumber(c.loadOhms)} ohms`,
    `AM at ${formatNumber(c.modulationPercent)} % modulation at ${formatNumber(c.modulationHz)} Hz`,
    "generator levels as µV (dBm taken into 50 ohms)",
    ...(c.batteryVolts ? [`battery ${formatNumber(c.batteryVolts)} V`] : []),
  ].join("; ");
}

/** The measured performance readings with their verdicts; undefined when none was measured. */
export function buildPerformanceSection(
  requirements: readonly PerformanceRequirement[],
  values: Readonly<Record<string, number | null | undefined>>,
  conditions: PerformanceConditions,
): PerformanceSection | undefined {
  const readings = requirements.flatMap((r) => {
    const raw = values[r.key];
    if (typeof raw !== "number" || !Number.isFinite(raw)) return [];
    const j = judgeReading(r, raw);
    return [
      { key: r.key, label: r.label, unit: r.unit, nominal: r.figure, value: raw, toleranceText: j.toleranceText, verdict: j.verdict },
    ];
  });
  return readings.length ? { conditions: describeConditions(conditions), readings } : undefined;
}

export type StoredSweep =
  | { curve: "response"; ifKHz: number; method: "sweep" | "generator"; points: PassbandPoint[] }
  | { curve: "discriminator"; ifKHz: number; method: "sweep" | "generator"; points: DiscriminatorPoint[]; linearityPercent?: number };

/** Each stored sweep with the figures read from it; undefined when nothing was swept. */
export function buildPassbandSection(sweeps: readonly StoredSweep[]): PassbandSection | undefined {
  const out: PassbandSection = sweeps.map((s) => {
    if (s.curve === "response") {
      const r = analysePassband(s.points);
      return {
        curve: "response" as const,
        ifKHz: s.ifKHz,
        method: s.method,
        points: s.points,
        peakOffsetKHz: r.peakOffsetKHz,
        centreKHz: r.centreKHz,
        width3KHz: r.db3.widthKHz,
        width6KHz: r.db6.widthKHz,
        symmetry3KHz: r.db3.symmetryKHz,
        symmetry6KHz: r.db6.symmetryKHz,
      };
    }
    const d = analyseDiscriminator(s.points, s.linearityPercent ?? DEFAULT_LINEARITY_PERCENT);
    return {
      curve: "discriminator" as const,
      ifKHz: s.ifKHz,
      method: s.method,
      points: s.points,
      zeroCrossingKHz: d.zeroCrossingKHz,
      linearLowKHz: d.linearLowKHz,
      linearHighKHz: d.linearHighKHz,
      linearityPercent: d.linearityPercent,
    };
  });
  return out.length ? out : undefined;
}

const kHzText = (v: number | null, signed = false) =>
  v === null ? "beyond the sweep" : `${signed && v > 0 ? "+" : ""}${formatNumber(v, 2)} kHz`;

/** One line of words per sweep, for the PDF and the verification page. */
export function passbandRows(section: PassbandSection): { ifText: string; what: string; figures: string[] }[] {
  return section.map((s) => {
    const ifText = s.ifKHz >= 10000 ? `${formatNumber(s.ifKHz / 1000, 4)} MHz` : `${formatNumber(s.ifKHz, 3)} kHz`;
    const how = s.method === "sweep" ? "swept" : "point by point with a generator";
    if (s.curve === "response") {
      return {
        ifText,
        what: `IF response, ${s.points.length} points, ${how}`,
        figures: [
          `−3 dB bandwidth ${kHzText(s.width3KHz)}`,
          `−6 dB bandwidth ${kHzText(s.width6KHz)}`,
          `centre ${kHzText(s.centreKHz, true)} from the IF`,
          `peak ${kHzText(s.peakOffsetKHz, true)}`,
          `symmetry at −3 dB ${kHzText(s.symmetry3KHz, true)}`,
        ],
      };
    }
    return {
      ifText,
      what: `FM discriminator, ${s.points.length} points, ${how}`,
      figures: [
        `zero crossing ${kHzText(s.zeroCrossingKHz, true)} from the IF`,
        `linear (slope within ±${formatNumber(s.linearityPercent)} %) from ${kHzText(s.linearLowKHz, true)} to ${kHzText(s.linearHighKHz, true)}`,
        `linear range ${kHzText(s.linearHighKHz - s.linearLowKHz)}`,
      ],
    };
  });
}
