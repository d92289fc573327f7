import type { CertificateContent } from "../certificates/content";
import type { WarrantyCoverage } from "./advise-claim";

/** What a claim is judged against: only what the signed certificate itself lists. */
export function coverageFromCertificate(content: CertificateContent): WarrantyCoverage {
  return {
    term: {
      startsOn: content.warranty.startsOn,
      endsOn: content.warranty.endsOn,
      termDays: content.warranty.termDays,
      returnedOn: content.completedOn,
    },
    workCodes: content.work.map((w) => w.code),
    partCodes: content.parts.map((p) => p.code),
    excluded: content.warranty.excluded.map((e) => e.code),
    titles: Object.fromEntries([...content.work.map((w) => [w.code, w.title]), ...content.parts.map((p) => [p.code, p.title])]),
  };
}
