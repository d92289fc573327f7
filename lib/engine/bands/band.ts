import { z } from "zod";

export const bandKinds = ["LW", "MW", "SW", "FM"] as const;
export type BandKind = (typeof bandKinds)[number];
export const bandKindSchema = z.enum(bandKinds);

/** A band as printed on a set's dial. Frequencies are always kHz, FM included (88–108 MHz is 88000–108000). */
export type Band = {
  kind: BandKind;
  lowKHz: number;
  highKHz: number;
  ifKHz: number;
  label?: string;
  /** The LO runs above the signal unless the set says otherwise. */
  injection?: Injection;
};

export const injections = ["high", "low"] as const;
export type Injection = (typeof injections)[number];
export const injectionSchema = z.enum(injections);

export type ItuRegion = 1 | 2 | 3;
