import { EngineError, requireFinite } from "../engine-error";

/** A channel raster: carriers at firstKHz + n·stepKHz up to lastKHz. */
export type Raster = { id: string; firstKHz: number; lastKHz: number; stepKHz: number };

// Integers in kHz for AM; FM works in kHz too (88.1 MHz = 88100 kHz) so all arithmetic stays exact.
export const rasters = {
  "mw-region-2": { id: "mw-region-2", firstKHz: 540, lastKHz: 1700, stepKHz: 10 },
  "mw-region-1-3": { id: "mw-region-1-3", firstKHz: 531, lastKHz: 1602, stepKHz: 9 },
  "lw-region-1": { id: "lw-region-1", firstKHz: 153, lastKHz: 279, stepKHz: 9 },
  "fm-us": { id: "fm-us", firstKHz: 88100, lastKHz: 107900, stepKHz: 200 },
  // Region 1 FM is planned on 100 kHz from 87.5 MHz.
  "fm-region-1": { id: "fm-region-1", firstKHz: 87500, lastKHz: 108000, stepKHz: 100 },
} as const satisfies Record<string, Raster>;

export type RasterId = keyof typeof rasters;

export function countCarriers(raster: Raster): number {
  return Math.floor((raster.lastKHz - raster.firstKHz) / raster.stepKHz) + 1;
}

export function isCarrier(kHz: number, raster: Raster): boolean {
  if (!Number.isFinite(kHz)) return false;
  if (kHz < raster.firstKHz || kHz > raster.lastKHz) return false;
  const offset = kHz - raster.firstKHz;
  return Number.isInteger(offset) && offset % raster.stepKHz === 0;
}

export function listCarriers(raster: Raster): number[] {
  const out: number[] = [];
  for (let f = raster.firstKHz; f <= raster.lastKHz; f += raster.stepKHz) out.push(f);
  return out;
}

/** Nearest carrier on the raster, clamped to its ends; useful for snapping a dial reading. */
export function nearestCarrier(kHz: number, raster: Raster): number {
  requireFinite(kHz, "kHz");
  const n = Math.round((kHz - raster.firstKHz) / raster.stepKHz);
  const clamped = Math.min(Math.max(n, 0), countCarriers(raster) - 1);
  return raster.firstKHz + clamped * raster.stepKHz;
}

/** US FM channel numbering: channel 201 is 88.1 MHz, each channel 200 kHz higher, up to 300 (107.9 MHz). */
export function fmChannelKHz(channel: number): number {
  if (!Number.isInteger(channel) || channel < 201 || channel > 300) {
    throw new EngineError("out-of-range", "US FM channels run from 201 to 300.", "channel");
  }
  return 88100 + 200 * (channel - 201);
}

export function fmChannelNumber(kHz: number): number | null {
  if (!isCarrier(kHz, rasters["fm-us"])) return null;
  return 201 + (kHz - 88100) / 200;
}
