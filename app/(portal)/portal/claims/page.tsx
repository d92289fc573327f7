import type { Metadata } from "next";
import Link from "next/link";
import { CertificateStatusBadge } from "@/components/warranty/certificate-status";
import { MyClaims } from "@/components/warranty/my-claims";
import { listCertificatesForCustomer } from "@/db/queries/certificates";
import { listClaimsForClaimant } from "@/db/queries/claims";
import { certificateStatus } from "@/lib/server/services/certificates";
import { claimSummary } from "@/lib/server/services/claims";
import { requirePermission } from "@/lib/server/session";
import { formatDay } from "@/lib/engine/dates";

export const metadata: Metadata = { title: "Warranty claims" };

export default async function PortalClaimsPage() {
  const viewer = await requirePermission("claim.open", "/portal/claims");
  const [certs, claims] = await Promise.all([
    listCertificatesForCustomer({ customerId: viewer.id }),
    listClaimsForClaimant({ claimantId: viewer.id }),
  ]);
  return (
    <div className="space-y-8">
      <div>
        <h1 className="text-3xl font-bold">Warranty claims</h1>
        <p className="text-bakelite-soft">
          If a set we restored develops a fault, open a claim from its certificate. We answer every claim by e-mail.
        </p>
      </div>

      <section aria-labelledby="certs-heading" className="space-y-3">
        <h2 id="certs-heading" className="text-xl font-semibold">
          My certificates
        </h2>
        {certs.length === 0 ? (
          <p className="text-bakelite-soft">
            You have no certificates yet. A certificate is issued when a restored set is returned to you.
          </p>
        ) : (
          <ul className="space-y-2">
            {certs.map((c) => {
              const { status, document: d } = certificateStatus(c);
              return (
                <li key={c.id} className="card flex flex-wrap items-center justify-between gap-3 p-4">
                  <div>
                    <p className="figure text-xs text-bakelite-muted">{c.code}</p>
                    <p className="font-semibold">{d ? `${d.set.maker} ${d.set.model}` : "Certificate"}</p>
                    {d ? <p className="text-sm text-bakelite-soft">Warranty until {formatDay(d.warranty.endsOn)}</p> : null}
                  </div>
                  <div className="flex flex-wrap items-center gap-3">
                    <CertificateStatusBadge status={status} />
                    <a className="btn-secondary" href={`/api/certificates/${c.id}/pdf`}>
                      Download PDF<span className="sr-only"> of certificate {c.code}</span>
                    </a>
                    {status === "valid" || status === "expired" ? (
                      <Link className="btn-primary" href={`/portal/claims/new?certificate=${c.id}`}>
                        Open a claim<span className="sr-only"> on certificate {c.code}</span>
                      </Link>
                    ) : null}
                  </div>
                </li>
              );
            })}
          </ul>
        )}
        <p className="text-sm">
          Bought a set restored by us? <Link href="/portal/claims/new">Claim with the certificate code</Link> if its warranty passes to a
          later owner.
        </p>
      </section>

      <section aria-labelledby="claims-heading" className="space-y-3">
        <h2 id="claims-heading" className="text-xl font-semibold">
          My claims
        </h2>
        <MyClaims initial={claims.map(claimSummary)} />
      </section>
    </div>
  );
}
