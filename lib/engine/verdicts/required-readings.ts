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

function window(t: { absKHz: number; percent: number }, reference: "mark" | "target", markKHz?: number): Tolerance {
  return { kind: "window", absKHz: t.absKHz, percent: t.percent, reference, ...(markKHz !== undefined ? { markKHz } : {}) };
}

// Printed after the tolerance so the bench sheet and the certificate say which reading a verdict came from.
const READ_AS_RECEIVED = "; dial calibration, read as the received frequency";
const readOnLo = (injection: "high" | "low") =>
  `; dial calibration at this mark, read on the LO (received = LO ${injection === "high" ? "−" : "+"} IF)`;

/** SW and FM frequencies are typed in MHz on the bench sheet; everything is stored in kHz. */
const entryUnitFor = (band: Band): { entryUnit?: "MHz" } => (band.kind === "SW" || band.kind === "FM" ? { entryUnit: "MHz" } : {});

/**
 * Every reading the bench sheet needs for this profile, with its nominal value and the tolerance that
 * will be printed on the certificate. Order follows the checklist.
 */
export function listRequiredReadings(
  profile: Pick<SetProfile, "kind" | "bands" | "bPlusVolts" | "mainsVolts">,
  tolerances: ToleranceSettings,
): ReadingRequirement[] {
  const out: ReadingRequirement[] = [];
  const push = (
    r: Omit<ReadingRequirement, "toleranceText">,
    context: { ifKHz?: number; injection?: "high" | "low"; suffix?: string } = {},
  ) => out.push({ ...r, toleranceText: describeTolerance(r.tolerance, context) + (context.suffix ?? "") });

  for (const { ifKHz, kind } of distinctIfs(profile.bands)) {
    push({
      key: readingKey.ifPeak(ifKHz),
      label: `IF peak at ${fmtKHz(ifKHz)}`,
      lineCode: `align.if.${ifKHz}`,
      unit: "kHz",
      nominal: ifKHz,
      measures: "if-peak",
      tolerance: window(tolerances.byBandKind[kind].ifPeak, "mark"),
    });
  }

  // Every frequency reading checks dial calibration: where the dial says a station is against where the set
  // receives it. Tracking proper, the antenna circuit peaking at the same place, is set by ear or meter at the
  // antenna trimmer and coil; it is not a frequency reading.
  profile.bands.forEach((band, i) => {
    const t = tolerances.byBandKind[band.kind].dial;
    const name = bandName(band, i);
    const injection = band.injection ?? "high";
    const lo = (f: number) => (injection === "high" ? f + band.ifKHz : f - band.ifKHz);
    const points = band.trackingPointsKHz ?? ruleOfThumbPoints(band);
    const unit = entryUnitFor(band);
    for (const [key, k] of [
      [readingKey.loLow(i), 0],
      [readingKey.loHigh(i), 2],
    ] as const) {
      push(
        {
          key,
          label: `${name}: dial calibration at the ${fmtKHz(points[k])} mark, LO frequency`,
          lineCode: `align.tracking.${i}`,
          unit: "kHz",
          ...unit,
          measures: "dial-calibration",
          nominal: lo(points[k]),
          tolerance: window(t, "target", points[k]),
        },
        { ifKHz: band.ifKHz, injection, suffix: readOnLo(injection) },
      );
    }
    points.forEach((p, k) =>
      push(
        {
          key: readingKey.track(i, k),
          label: `${name}: dial calibration at the ${fmtKHz(p)} mark, received frequency`,
          lineCode: `align.tracking.${i}`,
          unit: "kHz",
          ...unit,
          measures: "dial-calibration",
          nominal: p,
          tolerance: window(t, "mark"),
        },
        { suffix: READ_AS_RECEIVED },
      ),
    );
  });

  profile.bands.forEach((band, i) => {
    const t = tolerances.byBandKind[band.kind].dial;
    const name = bandName(band, i);
    const unit = entryUnitFor(band);
    push(
      {
        key: readingKey.edgeLow(i),
        label: `${name}: dial calibration at the low band edge`,
        lineCode: `align.dial.${i}`,
        unit: "kHz",
        ...unit,
        measures: "dial-calibration",
        nominal: band.lowKHz,
        tolerance: window(t, "mark"),
      },
      { suffix: READ_AS_RECEIVED },
    );
    push(
      {
        key: readingKey.edgeHigh(i),
        label: `${name}: dial calibration at the high band edge`,
        lineCode: `align.dial.${i}`,
        unit: "kHz",
        ...unit,
        measures: "dial-calibration",
        nominal: band.highKHz,
        tolerance: window(t, "mark"),
      },
      { suffix: READ_AS_RECEIVED },
    );
  });

  if (isTubeSet(profile.kind)) {
    push({
      key: readingKey.bPlus,
      label: "B+ at the filter output",
      lineCode: "test.voltages",
      unit: "V",
      measures: "b-plus",
      nominal: profile.bPlusVolts ?? null,
      // Without the schematic's figure there is nothing to judge against: the value is recorded, never passed.
      tolerance: profile.bPlusVolts === undefined ? { kind: "recorded" } : { kind: "percent", percent: tolerances.bPlusPercent },
    });
    // B+ follows the mains, so the mains voltage at the time goes with it.
    push({
      key: readingKey.bPlusMains,
      label: "Mains voltage while B+ was read",
      lineCode: "test.voltages",
      unit: "V",
      measures: "mains",
      nominal: null,
      tolerance: { kind: "recorded" },
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
