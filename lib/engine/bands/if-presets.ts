import type { BandKind } from "./band";

export type IfFamily = "AM" | "FM";

export type IfPreset = { kHz: number; label: string; family: IfFamily };

export const ifPresets: readonly IfPreset[] = [
  { kHz: 455, label: "455 kHz (US standard after about 1940)", family: "AM" },
  { kHz: 456, label: "456 kHz (late 1930s)", family: "AM" },
  { kHz: 465, label: "465 kHz (late 1930s US; European)", family: "AM" },
  { kHz: 452, label: "452 kHz (European)", family: "AM" },
  { kHz: 460, label: "460 kHz (European)", family: "AM" },
  { kHz: 468, label: "468 kHz (European)", family: "AM" },
  { kHz: 470, label: "470 kHz (European)", family: "AM" },
  { kHz: 447, label: "447 kHz (some Danish sets)", family: "AM" },
  { kHz: 262, label: "262 kHz (car sets)", family: "AM" },
  { kHz: 175, label: "175 kHz (early 1930s)", family: "AM" },
  { kHz: 10700, label: "10.7 MHz (FM)", family: "FM" },
];

/** Inputs outside these ranges are almost certainly typing errors (e.g. MHz typed as kHz). */
export const plausibleIfRangeKHz = {
  AM: { min: 100, max: 600 },
  FM: { min: 10600, max: 10800 },
} as const;

export function ifFamilyForBand(kind: BandKind): IfFamily {
  return kind === "FM" ? "FM" : "AM";
}

export function isPlausibleIf(ifKHz: number, family: "AM" | "FM"): boolean {
  const r = plausibleIfRangeKHz[family];
  return Number.isFinite(ifKHz) && ifKHz >= r.min && ifKHz <= r.max;
}

/** The family an IF belongs to, or null when it is plausible for neither. */
export function ifFamilyOf(ifKHz: number): IfFamily | null {
  if (isPlausibleIf(ifKHz, "AM")) return "AM";
  if (isPlausibleIf(ifKHz, "FM")) return "FM";
  return null;
}
