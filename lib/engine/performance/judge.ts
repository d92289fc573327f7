import {
  describeTolerance,
  judgeReading,
  type ReadingJudgement,
  type ReadingRequirement,
  type ReadingUnit,
  type Tolerance,
} from "../verdicts/judge-reading";

/**
 * Which way a performance reading is better. Sensitivity (the input that gives the reference output), the
 * AVC figure (output change over the input change), hum and a transistor set's idle current are better
 * lower; signal-to-noise, maximum output and a tube's tester reading better higher; an output-stage bias is
 * right near its figure.
 */
export type PerformanceDirection = "lower" | "higher" | "near";

/** How far an output-stage bias may sit from the service figure (common practice: bias figures are ±20 %). */
export const BIAS_PERCENT = 20;

/**
 * The tolerance a reading is judged by: the set's own service figure in the right direction, or, without a
 * figure, "recorded" (the value is kept and printed, never passed).
 */
export function performanceTolerance(direction: PerformanceDirection, figure: number | null | undefined, unit: ReadingUnit): Tolerance {
  if (figure === null || figure === undefined || !Number.isFinite(figure)) return { kind: "recorded" };
  if (direction === "lower") return { kind: "max", limit: figure, unit };
  if (direction === "higher") return { kind: "min", limit: figure, unit };
  return { kind: "percent", percent: BIAS_PERCENT };
}

export function performanceToleranceText(t: Tolerance, source: string): string {
  if (t.kind === "recorded") return "recorded, no service figure entered";
  if (t.kind === "percent") return `within ±${t.percent} % of ${source}`;
  return `${describeTolerance(t)} (${source})`;
}

/** Judges one performance reading against its figure; "recorded" when there is none. */
export function judgePerformance(
  direction: PerformanceDirection,
  figure: number | null | undefined,
  unit: ReadingUnit,
  value: number | null | undefined,
  source = "the set's service figure",
): ReadingJudgement {
  const tolerance = performanceTolerance(direction, figure, unit);
  const requirement: ReadingRequirement = {
    key: "performance",
    label: "",
    lineCode: "perf",
    unit,
    nominal: tolerance.kind === "percent" ? (figure ?? null) : null,
    tolerance,
    toleranceText: performanceToleranceText(tolerance, source),
  };
  return judgeReading(requirement, value);
}
