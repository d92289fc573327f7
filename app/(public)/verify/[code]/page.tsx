import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import { redirect } from "next/navigation";
import { BandEdgeTable } from "@/components/warranty/band-edge-table";
import { InstrumentsUsed } from "@/components/warranty/instruments-used";
import { CertificateStatusBadge } from "@/components/warranty/certificate-status";
import { Notice } from "@/components/ui/notice";
import { countVerifyRequest, getCertificateByCode, getCertificateById } from "@/db/queries/certificates";
import { normaliseCertificateCode } from "@/lib/engine/certificates";
import { setKindLabels } from "@/lib/engine/checklist/profile";
import { EngineError } from "@/lib/engine/engine-error";
import { clientAddressKey } from "@/lib/server/client-address";
import { certificateStatus, VERIFY_LIMIT_PER_MINUTE } from "@/lib/server/services/certificates";
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

export default async function VerifyCodePage({ params }: { params: Promise<{ code: string }> }) {
  const { code: rawCode } = await params;
  const count = await countVerifyRequest({ ip: clientAddressKey(await headers()), windowSeconds: 60 });
  if (count > VERIFY_LIMIT_PER_MINUTE) {
    return (
      <Shell>
        <h1 className="text-3xl font-bold">Certificate check</h1>
        <Notice tone="caution" title="Too many checks from your connection" live>
          <p>Please wait a minute and try again.</p>
        </Notice>
      </Shell>
    );
  }

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
    return (
      <Shell>
        <h1 className="text-3xl font-bold">Certificate check</h1>
        <Notice tone="error" title="No certificate has this code">
          <p>Check the code against the printed certificate. If it still is not found, the certificate was not issued by this shop.</p>
        </Notice>
      </Shell>
    );
  }

  // The signature is checked on every view: a row changed behind the shop's back is not shown as genuine.
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
          <span className="text-sm text-bakelite-soft">Signature checked just now: the contents are as the shop issued them.</span>
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
