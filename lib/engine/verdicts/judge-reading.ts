/**
 * kHz, mA and V for the alignment and safety readings; the performance readings add µV (generator input),
 * dB (ratios), mW (audio output), mV (bias) and "scale" (a tube tester's own scale).
 */
export type ReadingUnit = "kHz" | "mA" | "V" | "µV" | "dB" | "mW" | "mV" | "scale";

export type Tolerance =
  /**
   * |reading − nominal| ≤ max(absKHz, percent % of the mark). For a reading against a target (the LO,
   * mark ± IF) `markKHz` is the dial mark the percentage is taken of, so that the LO reading and the
   * received-frequency reading of one dial error get the same window.
   */
  | { kind: "window"; absKHz: number; percent: number; reference: "mark" | "target"; markKHz?: number }
  | { kind: "max"; limit: number; unit: ReadingUnit }
  /** Higher is better: at least the limit (signal-to-noise, output power, a tube against the tester's minimum). */
  | { kind: "min"; limit: number; unit: ReadingUnit }
  | { kind: "percent"; percent: number }
  | { kind: "recorded" };

/** What a reading checks, printed beside its tolerance so the certificate says where a verdict came from. */
export type ReadingMeasure = "if-peak" | "dial-calibration" | "leakage" | "b-plus" | "mains" | "performance";

export type ReadingRequirement = {
  key: string;
  label: string;
  lineCode: string;
  unit: ReadingUnit;
  /** Frequency readings typed in MHz (SW and FM); stored in kHz all the same. */
  entryUnit?: "MHz";
  measures?: ReadingMeasure;
  /** The mark or target; null for limits and for readings that are only recorded. */
  nominal: number | null;
  tolerance: Tolerance;
  toleranceText: string;
};

/** "recorded": a reading with no figure to judge it against (B+ without a schematic value, the mains voltage). */
export type Verdict = "pass" | "fail" | "missing" | "recorded";

export type ReadingJudgement = {
  verdict: Verdict;
  toleranceText: string;
  /** Reading minus nominal, where there is a nominal. */
  deviation?: number;
  /** The largest deviation (or value, for limits) that still passes. */
  allowed?: number;
};

/** Trims float noise so "1 %" never prints as "1.0000000002 %". */
export function formatNumber(x: number, maxDigits = 3): string {
  return String(Number(x.toFixed(maxDigits)));
}

export function describeTolerance(t: Tolerance, context: { ifKHz?: number; injection?: "high" | "low" } = {}): string {
  switch (t.kind) {
    case "window": {
      if (t.reference === "target") {
        // An LO reading: a dial-calibration window, turned into kHz at this mark.
        const allowed = windowAllowed(t, t.markKHz ?? 0);
        const sign = context.injection === "low" ? "−" : "+";
        const target =
          t.markKHz !== undefined && context.ifKHz !== undefined
            ? `the target (mark ${formatNumber(t.markKHz)} kHz ${sign} IF ${formatNumber(context.ifKHz)} kHz)`
            : "the target";
        return `within ±${formatNumber(allowed)} kHz of ${target}`;
      }
      const of = "of the mark";
      if (t.absKHz > 0 && t.percent > 0) {
        return `within ±${formatNumber(t.absKHz)} kHz or ${formatNumber(t.percent)} % ${of}, whichever is larger`;
      }
      if (t.percent > 0) return `within ±${formatNumber(t.percent)} % ${of}`;
      return `within ±${formatNumber(t.absKHz)} kHz ${of}`;
    }
    case "max":
      return `at most ${formatNumber(t.limit)} ${t.unit}`;
    case "min":
      return `at least ${formatNumber(t.limit)} ${t.unit}`;
    case "percent":
      return `within ±${formatNumber(t.percent)} % of the schematic value`;
    case "recorded":
      return "recorded, no figure to judge against";
  }
}

function windowAllowed(t: { absKHz: number; percent: number }, markKHz: number): number {
  return Math.max(t.absKHz, (t.percent / 100) * Math.abs(markKHz));
}

// Readings are typed to a few decimals; a reading exactly on the limit passes.
const EPS = 1e-9;

export function judgeReading(requirement: ReadingRequirement, value: number | null | undefined): ReadingJudgement {
  const toleranceText = requirement.toleranceText;
  if (value === null || value === undefined || typeof value !== "number" || !Number.isFinite(value)) {
    return { verdict: "missing", toleranceText };
  }
  const t = requirement.tolerance;
  const nominal = requirement.nominal;
  switch (t.kind) {
    case "window": {
      if (nominal === null) return { verdict: "missing", toleranceText };
      const allowed = windowAllowed(t, t.markKHz ?? nominal);
      const deviation = value - nominal;
      return { verdict: Math.abs(deviation) <= allowed + EPS ? "pass" : "fail", toleranceText, deviation, allowed };
    }
    case "percent": {
      if (nominal === null) return { verdict: "missing", toleranceText };
      const allowed = (t.percent / 100) * Math.abs(nominal);
      const deviation = value - nominal;
      return { verdict: Math.abs(deviation) <= allowed + EPS ? "pass" : "fail", toleranceText, deviation, allowed };
    }
    case "max":
      return { verdict: value <= t.limit + EPS ? "pass" : "fail", toleranceText, allowed: t.limit };
    case "min":
      return { verdict: value >= t.limit - EPS ? "pass" : "fail", toleranceText, allowed: t.limit };
    case "recorded":
      return { verdict: "recorded", toleranceText };
  }
}

export type SheetJudgement = {
  results: (ReadingRequirement & ReadingJudgement & { value: number | null })[];
  missing: string[];
  failing: string[];
  /** True when every required reading is present and passes: the completion gate. */
  complete: boolean;
};

export function judgeReadings(
  requirements: readonly ReadingRequirement[],
  readings: Readonly<Record<string, number | null | undefined>>,
): SheetJudgement {
  const results = requirements.map((r) => {
    const raw = readings[r.key];
    const value = typeof raw === "number" && Number.isFinite(raw) ? raw : null;
    return { ...r, ...judgeReading(r, value), value };
  });
  const missing = results.filter((r) => r.verdict === "missing").map((r) => r.key);
  const failing = results.filter((r) => r.verdict === "fail").map((r) => r.key);
  return { results, missing, failing, complete: missing.length === 0 && failing.length === 0 };
}
