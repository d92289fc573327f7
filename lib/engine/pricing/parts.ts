import { z } from "zod";

export const partCodes = [
  "cap.electrolytic",
  "cap.film",
  "cap.y2",
  "plug.polarized",
  "fuse.holder",
  "fuse",
  "cord.line",
  "diode.silicon",
  "resistor.series",
  "cord.dial",
  "battery.contacts",
] as const;
export type PartCode = (typeof partCodes)[number];
export const partCodeSchema = z.enum(partCodes);

export type CatalogueEntry = { title: string; costMinor: number; markupBp?: number };

/** Seeded USD costs (minor units) for the parts checklist rules call for. */
export const defaultPartsCatalogue: Record<PartCode, CatalogueEntry> = {
  "cap.electrolytic": { title: "Electrolytic capacitor, new", costMinor: 450 },
  "cap.film": { title: "Film capacitor (replaces paper)", costMinor: 120 },
  "cap.y2": { title: "Y2-class safety capacitor", costMinor: 150 },
  "plug.polarized": { title: "Polarized plug", costMinor: 600 },
  "fuse.holder": { title: "In-line fuse holder", costMinor: 350 },
  fuse: { title: "Fuse", costMinor: 50 },
  "cord.line": { title: "Line cord, two-wire polarized", costMinor: 900 },
  "diode.silicon": { title: "Silicon rectifier diode", costMinor: 40 },
  "resistor.series": { title: "Series resistor (selenium replacement)", costMinor: 60 },
  "cord.dial": { title: "Dial cord and spring", costMinor: 300 },
  "battery.contacts": { title: "Battery contacts", costMinor: 500 },
};
