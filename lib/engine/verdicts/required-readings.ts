import type { Band } from "../bands/band";
import { ruleOfThumbPoints } from "../alignment/tracking-points";
import { distinctIfs, isMainsSet, isTubeSet, type SetProfile } from "../checklist/profile";
import type { ToleranceSettings } from "./tolerances";
import { describeTolerance, formatNumber, type ReadingRequirement, type Tolerance } from "./judge-reading";
import { readingKey } from "./reading-keys";

const fmtKHz = (kHz: number) => (kHz >= 10000 ? `${formatNumber(kHz / 1000)} MHz` : `${formatNumber(kHz)} kHz`);

export function bandName(band: Band, index: number): string {
  return band.label?.trim() || `Band ${index + 1} (${band.kind} ${fmtKHz(band.lowKHz)}–${fmtKHz(band.highKHz)})`;
}

function window(t: { absKHz: number; percent: number }, reference: "mark" | "target"): Tolerance {
  return { kind: "window", absKHz: t.absKHz, percent: t.percent, reference };
}

/**
 * Every reading the bench sheet needs for this profile, with its nominal value and the tolerance that
 * will be printed on the certificate. Order follows the checklist.
 */
export function listRequiredReadings(
  profile: Pick<SetProfile, "kind" | "bands" | "bPlusVolts" | "mainsVolts">,
  tolerances: ToleranceSettings,
): ReadingRequirement[] {
  const out: ReadingRequirement[] = [];
  const push = (r: Omit<ReadingRequirement, "toleranceText">, ifKHz?: number) =>
    out.push({ ...r, toleranceText: describeTolerance(r.tolerance, { ifKHz }) });

  for (const { ifKHz, kind } of distinctIfs(profile.bands)) {
    push({
      key: readingKey.ifPeak(ifKHz),
      label: `IF peak at ${fmtKHz(ifKHz)}`,
      lineCode: `align.if.${ifKHz}`,
      unit: "kHz",
      nominal: ifKHz,
      tolerance: window(tolerances.byBandKind[kind].ifPeak, "mark"),
    });
  }

  profile.bands.forEach((band, i) => {
    const t = tolerances.byBandKind[band.kind];
    const name = bandName(band, i);
    const injection = band.injection ?? "high";
    const lo = (f: number) => (injection === "high" ? f + band.ifKHz : f - band.ifKHz);
    const points = ruleOfThumbPoints(band);
    push(
      {
        key: readingKey.loLow(i),
        label: `${name}: LO at ${fmtKHz(points[0])}`,
        lineCode: `align.tracking.${i}`,
        unit: "kHz",
        nominal: lo(points[0]),
        tolerance: window(t.lo, "target"),
      },
      band.ifKHz,
    );
    push(
      {
        key: readingKey.loHigh(i),
        label: `${name}: LO at ${fmtKHz(points[2])}`,
        lineCode: `align.tracking.${i}`,
        unit: "kHz",
        nominal: lo(points[2]),
        tolerance: window(t.lo, "target"),
      },
      band.ifKHz,
    );
    points.forEach((p, k) =>
      push({
        key: readingKey.track(i, k),
        label: `${name}: received at the ${fmtKHz(p)} mark`,
        lineCode: `align.tracking.${i}`,
        unit: "kHz",
        nominal: p,
        tolerance: window(t.dial, "mark"),
      }),
    );
  });

  profile.bands.forEach((band, i) => {
    const t = tolerances.byBandKind[band.kind];
    const name = bandName(band, i);
    push({
      key: readingKey.edgeLow(i),
      label: `${name}: low band edge`,
      lineCode: `align.dial.${i}`,
      unit: "kHz",
      nominal: band.lowKHz,
      tolerance: window(t.dial, "mark"),
    });
    push({
      key: readingKey.edgeHigh(i),
      label: `${name}: high band edge`,
      lineCode: `align.dial.${i}`,
      unit: "kHz",
      nominal: band.highKHz,
      tolerance: window(t.dial, "mark"),
    });
  });

  if (isTubeSet(profile.kind)) {
    push({
      key: readingKey.bPlus,
      label: "B+ at the filter output",
      lineCode: "test.voltages",
      unit: "V",
      nominal: profile.bPlusVolts ?? null,
      tolerance: profile.bPlusVolts === undefined ? { kind: "recorded" } : { kind: "percent", percent: tolerances.bPlusPercent },
    });
  }

  if (isMainsSet(profile.kind)) {
    const limit = (profile.mainsVolts ?? 120) === 230 ? tolerances.leakageLimitMA.v230 : tolerances.leakageLimitMA.v120;
    for (const [key, how] of [
      [readingKey.leakagePlugA, "plug one way"],
      [readingKey.leakagePlugB, "plug reversed"],
    ] as const) {
      push({
        key,
        label: `Leakage current, ${how}`,
        lineCode: "test.leakage",
        unit: "mA",
        nominal: null,
        tolerance: { kind: "max", limit, unit: "mA" },
      });
    }
  }
  return out;
}
