import { z } from "../zod";
import { bandKindSchema } from "../bands/band";
import { setKindSchema, type SetProfile } from "../checklist/profile";
import type { ShopPolicy } from "../shop-policy";
import { judgeReading, type ReadingRequirement } from "../verdicts/judge-reading";
import { coveredWording, coveredWordingKeySchema, exclusionCodeSchema, exclusionWording } from "../warranty/exclusions";
import { computeWarrantyTerm } from "../warranty/term";

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/);

/** What a certificate says. Signed as canonical JSON; every field is covered by the signature. */
export const certificateContentSchema = z.object({
  version: z.literal(1),
  code: z.string(),
  jobId: z.string(),
  shop: z.object({ name: z.string(), address: z.string(), phone: z.string() }),
  set: z.object({
    maker: z.string(),
    model: z.string(),
    year: z.number().int().optional(),
    serial: z.string().optional(),
    kind: setKindSchema,
  }),
  owner: z.object({ name: z.string() }),
  technician: z.object({ name: z.string() }),
  completedOn: isoDate,
  issuedOn: isoDate,
  bands: z.array(
    z.object({
      index: z.number().int(),
      kind: bandKindSchema,
      label: z.string().optional(),
      lowKHz: z.number(),
      highKHz: z.number(),
      ifKHz: z.number(),
    }),
  ),
  work: z.array(z.object({ code: z.string(), title: z.string() })),
  parts: z.array(z.object({ code: z.string(), title: z.string(), quantity: z.number().int() })),
  readings: z.array(
    z.object({
      key: z.string(),
      label: z.string(),
      unit: z.string(),
      nominal: z.number().nullable(),
      value: z.number().nullable(),
      toleranceText: z.string(),
      /** "recorded": a reading with no figure to judge it by (B+ without a schematic value, the mains voltage). */
      verdict: z.enum(["pass", "fail", "missing", "recorded"]),
    }),
  ),
  warranty: z.object({
    designation: z.enum(["limited", "full"]),
    termDays: z.number().int(),
    startsOn: isoDate,
    endsOn: isoDate,
    covered: z.array(z.object({ key: coveredWordingKeySchema, text: z.string() })),
    excluded: z.array(z.object({ code: exclusionCodeSchema, text: z.string() })),
    termsText: z.string(),
  }),
});
export type CertificateContent = z.infer<typeof certificateContentSchema>;

export type CertificateFacts = {
  code: string;
  jobId: string;
  shop: CertificateContent["shop"];
  set: CertificateContent["set"];
  owner: CertificateContent["owner"];
  technician: CertificateContent["technician"];
  completedOn: string;
  issuedOn: string;
  profile: Pick<SetProfile, "bands">;
  work: CertificateContent["work"];
  parts: CertificateContent["parts"];
  requirements: readonly ReadingRequirement[];
  readings: Readonly<Record<string, number | null | undefined>>;
  termsText: string;
};

/** Assembles the content from the finished job and the policy in force; the term starts the day after the return. */
export function buildCertificateContent(facts: CertificateFacts, policy: Pick<ShopPolicy, "warranty">): CertificateContent {
  const term = computeWarrantyTerm(facts.completedOn, policy.warranty.termDays);
  return {
    version: 1,
    code: facts.code,
    jobId: facts.jobId,
    shop: facts.shop,
    set: facts.set,
    owner: facts.owner,
    technician: facts.technician,
    completedOn: facts.completedOn,
    issuedOn: facts.issuedOn,
    bands: facts.profile.bands.map((b, index) => ({
      index,
      kind: b.kind,
      ...(b.label ? { label: b.label } : {}),
      lowKHz: b.lowKHz,
      highKHz: b.highKHz,
      ifKHz: b.ifKHz,
    })),
    work: facts.work,
    parts: facts.parts,
    readings: facts.requirements.map((r) => {
      const raw = facts.readings[r.key];
      const value = typeof raw === "number" && Number.isFinite(raw) ? raw : null;
      const j = judgeReading(r, value);
      return { key: r.key, label: r.label, unit: r.unit, nominal: r.nominal, value, toleranceText: j.toleranceText, verdict: j.verdict };
    }),
    warranty: {
      designation: policy.warranty.designation,
      termDays: term.termDays,
      startsOn: term.startsOn,
      endsOn: term.endsOn,
      covered: policy.warranty.coveredKeys.map((key) => ({ key, text: coveredWording[key] })),
      excluded: policy.warranty.excludedKeys.map((code) => ({ code, text: exclusionWording[code] })),
      termsText: facts.termsText,
    },
  };
}
