import { z } from "../zod";
import { exclusionCodeSchema, exclusionWording, type ExclusionCode } from "./exclusions";
import { isWithinTerm, type WarrantyTerm } from "./term";

export const claimSymptoms = [
  "no-power",
  "no-sound",
  "hum",
  "weak-reception",
  "dial-off-calibration",
  "dial-cord",
  "intermittent",
  "noisy-controls",
  "shock-or-tingle",
  "smoke-or-smell",
  "wear-item",
  "cosmetic",
  "other",
] as const;
export type ClaimSymptom = (typeof claimSymptoms)[number];
export const claimSymptomSchema = z.enum(claimSymptoms);

/** A piece of work (line-code prefix) or a part (part-code prefix) that could cause a symptom, and why. */
type Cause = { work?: string; part?: string; why: string };

/**
 * Which work and parts could cause each symptom (common practice at the bench). Inspections and tests are
 * left out: checking a set cannot make it fail.
 */
const symptomCauses: Record<ClaimSymptom, Cause[]> = {
  "no-power": [
    { work: "safety.fuse", part: "fuse", why: "the fuse fitted opens on a fault" },
    { work: "safety.polarized-plug-fuse", part: "plug.polarized", why: "the plug and fuse fitted carry the supply" },
    { work: "safety.line-cord", part: "cord.line", why: "the new line cord carries the supply" },
    { work: "safety.selenium", part: "diode.silicon", why: "the silicon rectifier fitted feeds the supply" },
    { work: "recap.electrolytic", part: "cap.electrolytic", why: "a shorted new filter capacitor takes the supply down" },
  ],
  "no-sound": [
    { work: "recap.paper", part: "cap.film", why: "the film capacitors fitted couple the signal between stages" },
    { work: "recap.electrolytic", part: "cap.electrolytic", why: "the electrolytic capacitors fitted feed and bypass the stages" },
  ],
  hum: [
    { work: "recap.electrolytic", part: "cap.electrolytic", why: "the filter capacitors fitted smooth the supply; a faulty one hums" },
    { work: "safety.selenium", part: "diode.silicon", why: "the rectifier fitted feeds the filter" },
  ],
  "weak-reception": [
    { work: "align", why: "the alignment done sets the gain of the IF and RF stages" },
    { work: "recap.paper", part: "cap.film", why: "the film capacitors fitted bypass and couple the RF and IF stages" },
  ],
  "dial-off-calibration": [
    { work: "align.tracking", why: "the oscillator setting done places the stations on the dial" },
    { work: "align.dial", why: "the dial calibration was checked at the band edges" },
    { work: "mech.dial-cord", part: "cord.dial", why: "the dial cord fitted moves the pointer" },
  ],
  "dial-cord": [{ work: "mech.dial-cord", part: "cord.dial", why: "the dial cord fitted moves the pointer" }],
  intermittent: [
    { work: "mech.clean-controls", why: "the controls and switch contacts cleaned can make poor contact" },
    { work: "recap", part: "cap.", why: "a joint on a capacitor fitted can be intermittent" },
  ],
  "noisy-controls": [{ work: "mech.clean-controls", why: "the controls cleaned can crackle again" }],
  "shock-or-tingle": [
    { work: "safety.y-capacitor", part: "cap.y2", why: "the line-to-chassis capacitor fitted bears on leakage to the cabinet" },
    { work: "safety.polarized-plug-fuse", part: "plug.polarized", why: "the polarized plug fitted keeps the chassis at neutral" },
    { work: "safety.line-cord", part: "cord.line", why: "the new line cord carries the mains" },
  ],
  "smoke-or-smell": [
    { work: "recap", part: "cap.", why: "a capacitor fitted can fail and overheat" },
    { work: "safety.selenium", part: "diode.silicon", why: "the rectifier and series resistor fitted carry the supply current" },
  ],
  "wear-item": [],
  cosmetic: [],
  other: [],
};

/** Symptoms that are themselves an exclusion, whatever else the claim says. */
const symptomExclusion: Partial<Record<ClaimSymptom, ExclusionCode>> = { cosmetic: "excl.cosmetic", "wear-item": "excl.wear-items" };

/** Symptoms where the set may be dangerous: the owner stops using it and it is inspected first, whatever the cover. */
const SAFETY_SYMPTOMS: readonly ClaimSymptom[] = ["shock-or-tingle", "smoke-or-smell"];

export function isSafetySymptom(symptom: string): boolean {
  return (SAFETY_SYMPTOMS as readonly string[]).includes(symptom);
}

export const SAFETY_ADVICE =
  "Stop using the set; inspect first. Ask the owner to unplug it and not use it until the shop has inspected it.";

export type WarrantyCoverage = {
  term: WarrantyTerm;
  /** Line codes of the work on the certificate. */
  workCodes: readonly string[];
  /** Part codes on the certificate. */
  partCodes: readonly string[];
  excluded: readonly ExclusionCode[];
  /** The certificate's own words for its work and parts, by code; the advice names them so. */
  titles?: Readonly<Record<string, string>>;
};

/** Each symptom as staff read it in the advice (the codes stay in the data). */
export const CLAIM_SYMPTOM_WORDS: Record<ClaimSymptom, string> = {
  "no-power": "No power",
  "no-sound": "No sound",
  hum: "Hum or buzz",
  "weak-reception": "Weak reception",
  "dial-off-calibration": "Stations off the dial markings",
  "dial-cord": "Dial pointer not moving",
  intermittent: "Cutting in and out",
  "noisy-controls": "Crackling controls",
  "shock-or-tingle": "Shock or tingle",
  "smoke-or-smell": "Smoke or burning smell",
  "wear-item": "A worn-out tube, lamp or battery",
  cosmetic: "Cosmetic wear",
  other: "Something else",
};

export const claimFindingSchema = z.object({
  code: exclusionCodeSchema,
  /** Confirmed by staff (or stated by the owner) versus only suspected from the photos. */
  status: z.enum(["confirmed", "suspected"]),
});
export type ClaimFinding = z.infer<typeof claimFindingSchema>;

export type ClaimFacts = {
  reportedOn: string;
  symptoms: readonly ClaimSymptom[];
  findings?: readonly ClaimFinding[];
};

export type ClaimAdvice = {
  outcome: "likely-covered" | "not-covered" | "inspect-first";
  reasons: string[];
  insideTerm: boolean;
  matchedWork: string[];
  matchedParts: string[];
};

const matches = (code: string, prefix: string) => code === prefix || code.startsWith(prefix.endsWith(".") ? prefix : `${prefix}.`);

/**
 * Advice for staff on a claim; staff decide. A shock or tingle (or smoke) is never "likely covered": the
 * owner stops using the set and it is inspected first. Otherwise, in order: the term, the exclusions the
 * certificate names (wear items among them unless the shop removed them), then whether each symptom
 * matches work or parts on the certificate that could cause it, each match with its reason.
 */
export function adviseClaim(coverage: WarrantyCoverage, claim: ClaimFacts): ClaimAdvice {
  const reasons: string[] = [];
  const insideTerm = isWithinTerm(coverage.term, claim.reportedOn);
  const excluded = new Set(coverage.excluded);
  const symptomFindings = claim.symptoms.flatMap((s): ClaimFinding[] => {
    const code = symptomExclusion[s];
    return code ? [{ code, status: "confirmed" }] : [];
  });
  const findings = [...(claim.findings ?? []), ...symptomFindings].filter((f) => excluded.has(f.code));

  const named = (code: string) => coverage.titles?.[code] ?? "an item on the certificate";
  const said = (s: ClaimSymptom) => CLAIM_SYMPTOM_WORDS[s] ?? "The symptom";
  const matchedWork = new Set<string>();
  const matchedParts = new Set<string>();
  const links: string[] = [];
  const unmatched: ClaimSymptom[] = [];
  for (const s of claim.symptoms) {
    let found = false;
    for (const cause of symptomCauses[s]) {
      const work = cause.work ? coverage.workCodes.filter((w) => matches(w, cause.work!)) : [];
      const parts = cause.part ? coverage.partCodes.filter((p) => matches(p, cause.part!)) : [];
      if (work.length + parts.length === 0) continue;
      found = true;
      work.forEach((w) => matchedWork.add(w));
      parts.forEach((p) => matchedParts.add(p));
      links.push(`${said(s)}: could come from ${[...work, ...parts].map(named).join(", ")}, since ${cause.why}.`);
    }
    if (!found && !symptomExclusion[s]) unmatched.push(s);
  }

  const safety = claim.symptoms.some((s) => SAFETY_SYMPTOMS.includes(s));
  if (safety) reasons.push(`Safety: ${SAFETY_ADVICE}`);

  const advice = (outcome: ClaimAdvice["outcome"]): ClaimAdvice => ({
    outcome: safety ? "inspect-first" : outcome,
    reasons,
    insideTerm,
    matchedWork: [...matchedWork],
    matchedParts: [...matchedParts],
  });

  if (!insideTerm) {
    reasons.push(
      coverage.term.termDays === 0
        ? "The certificate carries no warranty term."
        : `Reported on ${claim.reportedOn}, outside the term ${coverage.term.startsOn} to ${coverage.term.endsOn}.`,
    );
    return advice("not-covered");
  }
  reasons.push(`Reported on ${claim.reportedOn}, inside the term ${coverage.term.startsOn} to ${coverage.term.endsOn}.`);

  const confirmed = findings.filter((f) => f.status === "confirmed");
  if (confirmed.length > 0) {
    for (const f of confirmed) reasons.push(`Excluded: ${exclusionWording[f.code]}`);
    return advice("not-covered");
  }
  for (const s of claim.symptoms) {
    const code = symptomExclusion[s];
    if (code && !excluded.has(code)) reasons.push(`${said(s)}: this certificate does not exclude it; judge it on the bench.`);
  }
  const suspected = findings.filter((f) => f.status === "suspected");
  for (const f of suspected) reasons.push(`Possible exclusion, to confirm on the bench: ${exclusionWording[f.code]}`);

  reasons.push(...links);
  if (unmatched.length > 0)
    reasons.push(`No work or part on the certificate could cause: ${unmatched.map((s) => said(s).toLowerCase()).join(", ")}.`);

  const unexcludedSymptom = claim.symptoms.some((s) => symptomExclusion[s] && !excluded.has(symptomExclusion[s]!));
  if (suspected.length > 0 || unmatched.length > 0 || unexcludedSymptom || matchedWork.size + matchedParts.size === 0) {
    if (claim.symptoms.length === 0) reasons.push("No symptom was given.");
    return advice("inspect-first");
  }
  return advice("likely-covered");
}
