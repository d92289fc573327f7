import { z } from "../zod";

export const exclusionCodes = [
  "excl.physical-damage",
  "excl.opened-by-others",
  "excl.battery-leakage",
  "excl.wrong-supply",
  "excl.cosmetic",
  "excl.wear-items",
] as const;
export type ExclusionCode = (typeof exclusionCodes)[number];
export const exclusionCodeSchema = z.enum(exclusionCodes);

/** Plain wording for each exclusion, printed on the certificate and shown beside the claim advice. */
export const exclusionWording: Record<ExclusionCode, string> = {
  "excl.physical-damage": "Damage from a drop, knock, liquid, heat or other physical harm after return.",
  "excl.opened-by-others": "Faults after the set was opened or worked on by anyone other than the shop.",
  "excl.battery-leakage": "Damage from batteries left in the set, including corrosion from leaking cells.",
  "excl.wrong-supply": "Damage from connecting the set to the wrong supply voltage, battery or adapter.",
  "excl.cosmetic": "Cosmetic wear: cabinet, finish, dial glass, knobs and grille cloth.",
  "excl.wear-items": "Parts that wear out in use: tubes, dial lamps and batteries.",
};

export const coveredWordingKeys = ["covered.workmanship", "covered.parts-replaced", "covered.alignment", "covered.safety-work"] as const;
export type CoveredWordingKey = (typeof coveredWordingKeys)[number];
export const coveredWordingKeySchema = z.enum(coveredWordingKeys);

export const coveredWording: Record<CoveredWordingKey, string> = {
  "covered.workmanship": "The work listed on this certificate, done with reasonable care and skill.",
  "covered.parts-replaced": "The parts the shop fitted, as listed on this certificate.",
  "covered.alignment": "The alignment recorded on this certificate, within the tolerances printed beside each reading.",
  "covered.safety-work": "The safety work listed, including the leakage test result recorded here.",
};

/**
 * The same cover as the estimate states it, before any work is done: the certificate does not exist yet, so
 * the wording speaks of the work in the estimate and of the certificate the owner receives with the set.
 */
export const coveredWordingInEstimate: Record<CoveredWordingKey, string> = {
  "covered.workmanship": "The work in this estimate, once done, with reasonable care and skill.",
  "covered.parts-replaced": "The parts the shop fits, as the certificate you receive with the set will list them.",
  "covered.alignment": "The alignment the shop records on that certificate, within the tolerances printed beside each reading.",
  "covered.safety-work": "The safety work done, including the leakage test result the certificate records.",
};
