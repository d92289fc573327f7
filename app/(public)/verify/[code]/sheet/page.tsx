import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import { redirect } from "next/navigation";
import { BandEdgeTable } from "@/components/warranty/band-edge-table";
import { InstrumentsUsed } from "@/components/warranty/instruments-used";
import { CertificateStatusBadge } from "@/components/warranty/certificate-status";
import { Notice } from "@/components/ui/notice";
import { getCertificateByCode, getCertificateById } from "@/db/queries/certificates";
import { normaliseCertificateCode } from "@/lib/engine/certificates";
import { setKindLabels } from "@/lib/engine/checklist/profile";
import { EngineError } from "@/lib/engine/engine-error";
import { certificateStatus } from "@/lib/server/services/certificates";
import { isVerifyRenderRequest } from "@/lib/server/verify-pages";
import { maskSerial } from "@/lib/engine/certificates/document";
import { formatDate, formatDay } from "@/lib/engine/dates";
import { shopTimeZone } from "@/lib/server/services/shop";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Certificate check", robots: { index: false, follow: false } };

function Shell({ children }: { children: React.ReactNode }) {
  return (
    <div className="mx-auto max-w-prose space-y-5">
      {children}
      <p className="text-sm">
        <Link href="/verify">Check another certificate</Link>
      </p>
    </div>
  );
}

// The certificate check as the app renders it for itself: /verify/<code> (route.ts beside this folder) keeps
// the result per certificate version and serves it, and answers unknown codes and their limit. Anyone else
// asking for this address is sent to /verify/<code>.
function UnknownCode() {
  return (
    <Shell>
      <h1 className="text-3xl font-bold">Certificate check</h1>
      <Notice tone="error" title="No certificate has this code">
        <p>Check the code against the printed certificate. If it still is not found, the certificate was not issued by this shop.</p>
      </Notice>
    </Shell>
  );
}

export default async function VerifyCodeSheet({
  params,
  searchParams,
}: {
  params: Promise<{ code: string }>;
  searchParams: Promise<{ notice?: string }>;
}) {
  const { code: rawCode } = await params;
  if (!isVerifyRenderRequest(await headers())) redirect(`/verify/${rawCode}`);
  const { notice } = await searchParams;
  if (notice === "limited") {
    return (
      <Shell>
        <h1 className="text-3xl font-bold">Certificate check</h1>
        <Notice tone="caution" title="Too many unknown codes from your connection">
          <p>
            Several codes checked from your connection in the last minute were not issued by this shop, so checks of unknown codes are
            paused for a minute. Certificates that exist can still be opened at any time. Please compare the code with the printed
            certificate and try again in a minute.
          </p>
        </Notice>
      </Shell>
    );
  }
  if (notice === "unknown") return <UnknownCode />;

  let code: string;
  try {
    code = normaliseCertificateCode(decodeURIComponent(rawCode));
  } catch (e) {
    // A malformed escape (URIError) is just as much "not a code" as a wrong length.
    if (!(e instanceof EngineError) && !(e instanceof URIError)) throw e;
    return (
      <Shell>
        <h1 className="text-3xl font-bold">Certificate check</h1>
        <Notice tone="error" title="That is not a certificate code">
          <p>A certificate code has 28 letters and digits in groups of four, as printed under the QR code.</p>
        </Notice>
      </Shell>
    );
  }
  if (code !== rawCode) redirect(`/verify/${code}`);

  const row = await getCertificateByCode({ code });
  if (!row) {
    return <UnknownCode />;
  }

  // The signature is checked whenever the page is rendered, which is once per row version: a row changed
  // behind the shop's back is not shown as genuine.
  const { status, document: d } = certificateStatus(row);
  if (status === "unverifiable" || !d) {
    return (
      <Shell>
        <h1 className="text-3xl font-bold">Certificate check</h1>
        <p className="figure text-sm">{code}</p>
        <CertificateStatusBadge status="unverifiable" />
        <Notice tone="error" title="This certificate cannot be verified" live>
          <p>Its contents do not match the shop&apos;s signature, so nothing on it can be trusted. Please contact the shop.</p>
        </Notice>
      </Shell>
    );
  }
  const newer = row.supersededById ? await getCertificateById({ certificateId: row.supersededById }) : null;
  const serial = maskSerial(d.set.serial);
  const designation = d.warranty.designation === "full" ? "Full" : "Limited";

  return (
    <Shell>
      <div>
        <p className="text-sm uppercase tracking-wide text-bakelite-muted">Warranty certificate · {d.shop.name}</p>
        <h1 className="text-3xl font-bold">
          {d.set.maker} {d.set.model}
        </h1>
        <p className="figure text-sm text-bakelite-soft">{code}</p>
      </div>

      <div className="card space-y-3 p-5">
        <div className="flex flex-wrap items-center gap-3">
          <CertificateStatusBadge status={status} />
          <span className="text-sm text-bakelite-soft">Signature checked: the contents are as the shop issued them.</span>
        </div>
        {status === "valid" ? (
          <p>
            {designation} warranty of {d.warranty.termDays} days, in force from <strong>{formatDay(d.warranty.startsOn)}</strong> until{" "}
            <strong>{formatDay(d.warranty.endsOn)}</strong>.
          </p>
        ) : null}
        {status === "expired" ? (
          <p>
            The {designation.toLowerCase()} warranty of {d.warranty.termDays} days ended on <strong>{formatDay(d.warranty.endsOn)}</strong>.
            The measurements below are still those recorded when the set left the shop.
          </p>
        ) : null}
        {status === "revoked" ? (
          <Notice tone="error" title={`Revoked on ${formatDate(row.revokedAt, { timeZone: await shopTimeZone() })}`}>
            <p>The shop revoked this certificate. Reason given: {row.revokeReason}</p>
          </Notice>
        ) : null}
        {status === "superseded" ? (
          <Notice tone="caution" title="Superseded by a corrected certificate">
            <p>
              The shop replaced this certificate with a corrected one
              {newer ? (
                <>
                  :{" "}
                  <Link href={`/verify/${newer.code}`} className="figure">
                    {newer.code}
                  </Link>
                </>
              ) : null}
              . Rely on the newer certificate.
            </p>
          </Notice>
        ) : null}
        {d.correction ? <p className="text-sm">This certificate corrects an earlier one ({d.correction.supersedesCode}).</p> : null}
        {d.answers ? (
          <p className="text-sm" data-testid="answers">
            Warranty work under certificate {d.answers.certificateCode} (claim of {formatDay(d.answers.claimOpenedOn)}): it covers the work
            and parts listed here.
          </p>
        ) : null}
        <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-2">
          <div>
            <dt className="field-label">Set</dt>
            <dd>
              {d.set.maker} {d.set.model}
              {d.set.year ? ` (${d.set.year})` : ""}
            </dd>
          </div>
          <div>
            <dt className="field-label">Kind</dt>
            <dd>{setKindLabels[d.set.kind]}</dd>
          </div>
          <div>
            <dt className="field-label">Serial number</dt>
            <dd className="figure">{serial ?? "not recorded"}</dd>
          </div>
          <div>
            <dt className="field-label">Restoration completed</dt>
            <dd>{formatDay(d.completedOn)}</dd>
          </div>
          <div>
            <dt className="field-label">Passes to a later owner</dt>
            <dd>{d.terms.transferable ? "Yes, for the rest of the term" : "No, it covers the original owner only"}</dd>
          </div>
        </dl>
      </div>

      <div className="card p-5">
        <BandEdgeTable document={d} />
      </div>
      {d.instruments?.length ? (
        <div className="card p-5">
          <InstrumentsUsed document={d} />
        </div>
      ) : null}
      <p className="text-sm text-bakelite-muted">
        This page shows only what a buyer needs to check the set. Owners see the full certificate, with every reading and the warranty
        terms, in their portal.
      </p>
    </Shell>
  );
}
