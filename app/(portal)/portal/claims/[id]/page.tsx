import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getClaimForClaimant } from "@/db/queries/claims";
import { isUuid } from "@/lib/server/services/certificates";
import { CLAIM_STATUS_LABEL, claimSummary } from "@/lib/server/services/claims";
import { requirePermission } from "@/lib/server/session";
import { formatDate } from "@/lib/engine/dates";
import { shopTimeZone } from "@/lib/server/services/shop";
import { SYMPTOM_LABEL } from "@/lib/validation/claims";
import type { ClaimSymptom } from "@/lib/engine/warranty";

export const metadata: Metadata = { title: "Warranty claim" };

export default async function ClaimPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const viewer = await requirePermission("claim.open", `/portal/claims/${id}`);
  const timeZone = await shopTimeZone();
  const row = isUuid(id) ? await getClaimForClaimant({ claimId: id, claimantId: viewer.id }) : null;
  if (!row) notFound();
  const c = claimSummary(row);
  const label = CLAIM_STATUS_LABEL[row.claim.status];
  return (
    <div className="mx-auto max-w-prose space-y-4">
      <p className="text-sm">
        <Link href="/portal/claims">Warranty claims</Link>
      </p>
      <h1 className="text-3xl font-bold">Claim on the {c.setName}</h1>
      <div className="card space-y-3 p-5">
        <p className="text-lg font-semibold">
          <span aria-hidden="true">{label.icon} </span>
          {label.owner}
        </p>
        <dl className="grid grid-cols-1 gap-2 sm:grid-cols-2">
          <div>
            <dt className="field-label">Opened</dt>
            <dd>{formatDate(c.createdAt, { timeZone })}</dd>
          </div>
          <div>
            <dt className="field-label">Certificate</dt>
            <dd className="figure">{c.certificateCode}</dd>
          </div>
          <div>
            <dt className="field-label">Symptom</dt>
            <dd>{SYMPTOM_LABEL[row.claim.symptomCategory as ClaimSymptom] ?? row.claim.symptomCategory}</dd>
          </div>
          {c.decidedAt ? (
            <div>
              <dt className="field-label">Decided</dt>
              <dd>{formatDate(c.decidedAt, { timeZone })}</dd>
            </div>
          ) : null}
        </dl>
        <div>
          <h2 className="field-label">Your description</h2>
          <p className="whitespace-pre-wrap">{row.claim.description}</p>
        </div>
        {c.decisionReason ? (
          <div>
            <h2 className="field-label">The shop&apos;s answer</h2>
            <p className="whitespace-pre-wrap">{c.decisionReason}</p>
          </div>
        ) : null}
        {c.warrantyJobId ? (
          <p>
            <Link href={`/portal/jobs/${c.warrantyJobId}`} className="btn-primary">
              See the warranty job
            </Link>
          </p>
        ) : null}
      </div>
    </div>
  );
}
