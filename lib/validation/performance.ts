import { z } from "@/lib/engine/zod";
import { discriminatorPointSchema, passbandPointSchema } from "@/lib/engine/passband";
import { performanceConditionsSchema } from "@/lib/engine/performance";

/**
 * PUT /api/bench/jobs/:id/performance: the opt-in, the conditions and the service figures. A figure of null
 * takes it away (the reading is then recorded, not judged); figures left out stay as they were.
 */
export const performanceUpdateSchema = z.object({
  enabled: z.boolean({ error: "Say whether performance readings are taken on this job (true or false)." }),
  conditions: performanceConditionsSchema.optional(),
  figures: z
    .record(
      z.string().min(1).max(60),
      z.number({ error: "A service figure is a number, or null to take it away." }).finite("A service figure is a number.").nullable(),
    )
    .optional(),
});
export type PerformanceUpdate = z.infer<typeof performanceUpdateSchema>;

/** POST /api/bench/jobs/:id/passband: one strip's sweep; an empty list of points takes the sweep away. */
export const passbandSweepInputSchema = z.discriminatedUnion("curve", [
  z.object({
    curve: z.literal("response"),
    ifKHz: z.number({ error: "Name the IF strip in kHz." }).positive(),
    method: z.enum(["sweep", "generator"], { error: 'Method: "sweep" or "generator".' }),
    points: z.array(passbandPointSchema).max(400, "At most 400 points."),
  }),
  z.object({
    curve: z.literal("discriminator"),
    ifKHz: z.number({ error: "Name the IF strip in kHz." }).positive(),
    method: z.enum(["sweep", "generator"], { error: 'Method: "sweep" or "generator".' }),
    points: z.array(discriminatorPointSchema).max(400, "At most 400 points."),
    linearityPercent: z.number().positive().max(100).optional(),
  }),
]);
export type PassbandSweepInput = z.infer<typeof passbandSweepInputSchema>;

/**
 * The sweep as typed on the bench sheet: one point a line, offset in kHz then the response ("−10 −6.5",
 * "-10, -6.5", "10\t-6"). Returns the points, or the message naming the first line it cannot read.
 */
export function parseSweepText(text: string): { points: { offsetKHz: number; value: number }[] } | { error: string } {
  const points: { offsetKHz: number; value: number }[] = [];
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i]!.replace(/[−–]/g, "-").trim();
    if (line === "") continue;
    const parts = line.split(/[\s,;]+/).filter(Boolean);
    const nums = parts.map(Number);
    if (parts.length !== 2 || nums.some((n) => !Number.isFinite(n))) {
      return { error: `Line ${i + 1}: give the offset in kHz and the reading, e.g. "-5 -3.2".` };
    }
    points.push({ offsetKHz: nums[0]!, value: nums[1]! });
  }
  return { points };
}
