import { z } from "../zod";
import { applyBasisPoints, checkAmount } from "./money";

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

/**
 * The shop's catalogue as the engine reads it: checklist part code → entry. The shop keeps it in the part
 * table; the server hands the coded parts to the checklist's automatic part lines.
 */
export type PartsCatalogue = Readonly<Partial<Record<string, CatalogueEntry>>>;

/**
 * The price of one unit: cost × (1 + markup), rounded half up once to a minor unit by the one money
 * rounding rule (4.50 at 35 % is 6.075, charged 6.08).
 */
export function partUnitPriceMinor(costMinor: number, markupBp: number, field = "unitCostMinor"): number {
  checkAmount(costMinor, field);
  return applyBasisPoints(costMinor, 10_000 + markupBp);
}

/**
 * Seeded USD costs (minor units) for the parts checklist rules call for: the first rows of the part table
 * (db/migrations/0012_parts-catalogue-table.sql), and the catalogue of engine tests.
 */
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
