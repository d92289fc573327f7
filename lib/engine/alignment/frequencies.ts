import { requirePositive } from "../engine-error";
import type { AlignmentBasis, DialRange, Injection } from "./inputs";

/** f[kHz] = K / √(L[µH]·C[pF]); keeps every formula in bench units. */
export const RESONANCE_K = 1e6 / (2 * Math.PI);

export function resonantKHz(inductanceUH: number, capacitancePF: number): number {
  requirePositive(inductanceUH, "inductanceUH", "Inductance");
  requirePositive(capacitancePF, "capacitancePF", "Capacitance");
  return RESONANCE_K / Math.sqrt(inductanceUH * capacitancePF);
}

export function resonantPF(inductanceUH: number, kHz: number): number {
  requirePositive(inductanceUH, "inductanceUH", "Inductance");
  requirePositive(kHz, "kHz", "Frequency");
  return (RESONANCE_K / kHz) ** 2 / inductanceUH;
}

export function resonantUH(capacitancePF: number, kHz: number): number {
  requirePositive(capacitancePF, "capacitancePF", "Capacitance");
  requirePositive(kHz, "kHz", "Frequency");
  return (RESONANCE_K / kHz) ** 2 / capacitancePF;
}

export function localOscillatorKHz(rfKHz: number, ifKHz: number, injection: Injection = "high"): number {
  return injection === "high" ? rfKHz + ifKHz : rfKHz - ifKHz;
}

/** The other frequency that mixes with the LO to the IF; with a low LO it can fold below zero, hence |…|. */
export function imageKHz(rfKHz: number, ifKHz: number, injection: Injection = "high"): number {
  return injection === "high" ? rfKHz + 2 * ifKHz : Math.abs(rfKHz - 2 * ifKHz);
}

/**
 * Image rejection of a single tuned circuit of loaded Q: α = √(1 + Q²ρ²), ρ = f_img/f − f/f_img.
 * The inputs come checked from the engine's door (a positive frequency, IF and Q).
 */
export function imageRejection(rfKHz: number, ifKHz: number, loadedQ: number, injection: Injection = "high") {
  const img = imageKHz(rfKHz, ifKHz, injection);
  const rho = img / rfKHz - rfKHz / img;
  const ratio = Math.sqrt(1 + loadedQ * loadedQ * rho * rho);
  return { imageKHz: img, rho, ratio, dB: 20 * Math.log10(ratio) };
}

/** C_max/C_min = (f_max/f_min)² for a tank tuned by a variable capacitor alone. */
export function capacitanceRatio(lowKHz: number, highKHz: number): number {
  return (highKHz / lowKHz) ** 2;
}

export type BandFrequencies = {
  lo: DialRange;
  image: DialRange;
  capacitanceRatio: { signal: number; oscillator: number };
};

/** LO, image and capacitance ratios of a checked band. */
export function bandFrequencies({ band, ifKHz, injection }: AlignmentBasis): BandFrequencies {
  const loLow = localOscillatorKHz(band.lowKHz, ifKHz, injection);
  const loHigh = localOscillatorKHz(band.highKHz, ifKHz, injection);
  return {
    lo: { lowKHz: loLow, highKHz: loHigh },
    image: { lowKHz: imageKHz(band.lowKHz, ifKHz, injection), highKHz: imageKHz(band.highKHz, ifKHz, injection) },
    capacitanceRatio: { signal: (band.highKHz / band.lowKHz) ** 2, oscillator: (loHigh / loLow) ** 2 },
  };
}
