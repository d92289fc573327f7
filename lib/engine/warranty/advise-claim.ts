import { z } from "zod";
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
  "cosmetic",
  "other",
] as const;
export type ClaimSymptom = (typeof claimSymptoms)[number];
export const claimSymptomSchema = z.enum(claimSymptoms);

/** Which work (line-code prefixes) and parts (part-code prefixes) could be behind each symptom. */
const symptomCoverage: Record<ClaimSymptom, { work: string[]; parts: string[] }> = {
  "no-power": {
    work: ["safety.fuse", "safety.polarized-plug-fuse", "safety.line-cord", "safety.selenium", "recap.electrolytic"],
    parts: ["fuse", "cord.line", "diode.silicon", "plug.polarized"],
  },
  "no-sound": { work: ["recap", "inspect.fault-find", "test.voltages"], parts: ["cap."] },
  hum: { work: ["recap.electrolytic", "safety.selenium"], parts: ["cap.electrolytic", "diode.silicon"] },
  "weak-reception": { work: ["align", "recap.paper"], parts: ["cap.film"] },
  "dial-off-calibration": { work: ["align.tracking", "align.dial", "mech.dial-cord"], parts: ["cord.dial"] },
  "dial-cord": { work: ["mech.dial-cord"], parts: ["cord.dial"] },
  intermittent: { work: ["inspect.fault-find", "mech.clean-controls", "recap"], parts: ["cap."] },
  "noisy-controls": { work: ["mech.clean-controls"], parts: [] },
  "shock-or-tingle": {
    work: ["safety.y-capacitor", "safety.polarized-plug-fuse", "safety.line-cord", "test.leakage"],
    parts: ["cap.y2", "plug.polarized", "cord.line"],
  },
  "smoke-or-smell": { work: ["recap", "safety"], parts: ["cap.", "diode.silicon"] },
  cosmetic: { work: [], parts: [] },
  other: { work: [], parts: [] },
};

/** Symptoms that are themselves an exclusion, whatever else the claim says. */
const symptomExclusion: Partial<Record<ClaimSymptom, ExclusionCode>> = { cosmetic: "excl.cosmetic" };

const SAFETY_SYMPTOMS: readonly ClaimSymptom[] = ["shock-or-tingle", "smoke-or-smell"];

export type WarrantyCoverage = {
  term: WarrantyTerm;
  /** Line codes of the work on the certificate. */
  workCodes: readonly string[];
  /** Part codes on the certificate. */
  partCodes: readonly string[];
  excluded: readonly ExclusionCode[];
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
 * Advice for staff on a claim; staff decide. Order of reasoning: the term, then exclusions the
 * certificate names, then whether the symptom plausibly comes from the work and parts listed.
 */
export function adviseClaim(coverage: WarrantyCoverage, claim: ClaimFacts): ClaimAdvice {
  const reasons: string[] = [];
  const insideTerm = isWithinTerm(coverage.term, claim.reportedOn);
  const excluded = new Set(coverage.excluded);
  const findings = [
    ...(claim.findings ?? []),
    ...claim.symptoms.flatMap((s): ClaimFinding[] => {
      const code = symptomExclusion[s];
      return code ? [{ code, status: "confirmed" }] : [];
    }),
  ].filter((f) => excluded.has(f.code));

  const matchedWork = new Set<string>();
  const matchedParts = new Set<string>();
  const unmatched: ClaimSymptom[] = [];
  for (const s of claim.symptoms) {
    const c = symptomCoverage[s];
    const work = coverage.workCodes.filter((w) => c.work.some((p) => matches(w, p)));
    const parts = coverage.partCodes.filter((p) => c.parts.some((q) => matches(p, q)));
    work.forEach((w) => matchedWork.add(w));
    parts.forEach((p) => matchedParts.add(p));
    if (work.length === 0 && parts.length === 0 && !symptomExclusion[s]) unmatched.push(s);
  }

  if (claim.symptoms.some((s) => SAFETY_SYMPTOMS.includes(s))) {
    reasons.push("Safety: ask the owner to unplug the set and not use it until it has been inspected.");
  }

  const advice = (outcome: ClaimAdvice["outcome"]): ClaimAdvice => ({
    outcome,
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
  reasons.push(`Reported on ${claim.reportedOn}, inside the term ending ${coverage.term.endsOn}.`);

  const confirmed = findings.filter((f) => f.status === "confirmed");
  if (confirmed.length > 0) {
    for (const f of confirmed) reasons.push(`Excluded: ${exclusionWording[f.code]}`);
    return advice("not-covered");
  }
  const suspected = findings.filter((f) => f.status === "suspected");
  for (const f of suspected) reasons.push(`Possible exclusion, to confirm on the bench: ${exclusionWording[f.code]}`);

  if (matchedWork.size > 0) reasons.push(`Linked to work on the certificate: ${[...matchedWork].join(", ")}.`);
  if (matchedParts.size > 0) reasons.push(`Linked to parts on the certificate: ${[...matchedParts].join(", ")}.`);
  if (unmatched.length > 0) reasons.push(`Not obviously linked to the work or parts listed: ${unmatched.join(", ")}.`);

  if (suspected.length > 0 || unmatched.length > 0 || matchedWork.size + matchedParts.size === 0) {
    if (claim.symptoms.length === 0) reasons.push("No symptom was given.");
    return advice("inspect-first");
  }
  return advice("likely-covered");
}
