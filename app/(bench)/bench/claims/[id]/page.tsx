import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { CertificateStatusBadge } from "@/components/warranty/certificate-status";
import { DecisionForm } from "@/components/warranty/decision-form";
import { Notice } from "@/components/ui/notice";
import { getClaimForStaff, listClaimPhotos } from "@/db/queries/claims";
import { jobNumber } from "@/lib/engine/jobs/states";
import { can } from "@/lib/engine/permissions";
import { certificateStatus, isUuid } from "@/lib/server/services/certificates";
import { CLAIM_STATUS_LABEL, computeAdvice, OUTCOME_LABEL, type StoredAdvice } from "@/lib/server/services/claims";
import { isSafetySymptom } from "@/lib/engine/warranty/advise-claim";
import { requirePermission } from "@/lib/server/session";
import { shopTimeZone } from "@/lib/server/services/shop";
import { formatDateTime, formatDay } from "@/lib/engine/dates";
import { SYMPTOM_LABEL } from "@/lib/validation/claims";
import { exclusionWording, type ClaimSymptom } from "@/lib/engine/warranty";

export const metadata: Metadata = { title: "Claim" };

export default async function BenchClaimPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const viewer = await requirePermission("claim.review", `/bench/claims/${id}`);
  const timeZone = await shopTimeZone();
  const row = isUuid(id) ? await getClaimForStaff({ claimId: id }) : null;
  if (!row) notFound();
  const photos = await listClaimPhotos({ claimId: id });
  const advice = row.claim.advice as unknown as StoredAdvice;
  // A shock, tingle or smoke is never "likely covered", also on advice stored before that rule.
  const safetyClaim = (advice.symptoms ?? []).some((s) => isSafetySymptom(s));
  const { status, document: d } = certificateStatus(row.certificate);
  const st = CLAIM_STATUS_LABEL[row.claim.status];
  // The reasons are read in words: advice stored before the advice named work by its title is worded again
  // from the same facts and the certificate (the outcome shown is the stored one).
  const symptom = advice.symptoms?.[0];
  const reasons =
    d && symptom && advice.reportedOn
      ? computeAdvice(d, { reportedOn: advice.reportedOn, symptom, findings: advice.findings ?? [] }, advice.computedBy).reasons
      : advice.reasons;
  const codes = [...(advice.matchedWork ?? []), ...(advice.matchedParts ?? [])];
  const undecided = row.claim.status === "open" || row.claim.status === "inspecting";
  return (
    <div className="space-y-4">
      <p className="text-sm">
        <Link href="/bench/claims">Claims</Link>
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-bold">Claim: {d ? `${d.set.maker} ${d.set.model}` : row.certificateCode}</h1>
        <span className="font-semibold">
          <span aria-hidden="true">{st.icon} </span>
          {st.staff}
        </span>
      </div>
      {safetyClaim ? (
        <Notice tone="caution" title="Stop using the set; inspect first">
          <p>
            Ask the owner to unplug the set and not use it. Treat the chassis as live until it is checked on the isolation transformer;
            follow local codes and licensed practice.
          </p>
        </Notice>
      ) : null}
      <div className="grid gap-4 lg:grid-cols-2">
        <section className="card space-y-2 p-4" aria-labelledby="claim-h">
          <h2 id="claim-h" className="font-semibold">
            What the owner reports
          </h2>
          <p>
            <strong>{SYMPTOM_LABEL[row.claim.symptomCategory as ClaimSymptom] ?? row.claim.symptomCategory}</strong> · opened{" "}
            {formatDateTime(row.claim.createdAt, { timeZone, style: "compact" })} by {row.claimantName} ({row.claimantEmail})
            {row.certificateCustomerId !== row.claim.claimantId ? " — a later owner, claiming with the code" : ""}
          </p>
          <p className="whitespace-pre-wrap">{row.claim.description}</p>
          {(advice.findings ?? []).length > 0 ? (
            <ul className="list-disc pl-5 text-sm">
              {advice.findings.map((f) => (
                <li key={f.code}>{exclusionWording[f.code]}</li>
              ))}
            </ul>
          ) : (
            <p className="text-sm text-bakelite-soft">No exclusion stated.</p>
          )}
          {photos.length > 0 ? (
            <ul className="flex flex-wrap gap-2">
              {photos.map((p) => (
                <li key={p.id}>
                  <a href={`/api/photos/${p.id}`}>
                    {/* eslint-disable-next-line @next/next/no-img-element -- photos come re-encoded from our own authorised route; the image optimiser would fetch them without the session */}
                    <img
                      src={`/api/photos/${p.id}?size=thumb`}
                      alt={p.displayName}
                      width={96}
                      height={96}
                      className="h-24 w-24 rounded-card object-cover"
                    />
                  </a>
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-sm text-bakelite-soft">No photos.</p>
          )}
        </section>
        <section className="card space-y-2 p-4" aria-labelledby="advice-h">
          <h2 id="advice-h" className="font-semibold">
            Coverage advice: {OUTCOME_LABEL[safetyClaim ? "inspect-first" : advice.outcome]}
          </h2>
          <ul className="list-disc space-y-1 pl-5 text-sm">
            {reasons.map((r, i) => (
              <li key={i}>{r}</li>
            ))}
          </ul>
          <p className="text-sm text-bakelite-soft">Advice only: the decision is yours.</p>
          {codes.length > 0 ? (
            <details className="text-xs text-bakelite-muted" data-testid="advice-details">
              <summary className="cursor-pointer">Details for staff</summary>
              <p>
                Checklist and part codes matched: <span className="figure">{codes.join(", ")}</span>
              </p>
            </details>
          ) : null}
        </section>
      </div>
      <section className="card space-y-2 p-4" aria-labelledby="cert-h">
        <div className="flex flex-wrap items-center gap-3">
          <h2 id="cert-h" className="font-semibold">
            Certificate <span className="figure">{row.certificateCode}</span>
          </h2>
          <CertificateStatusBadge status={status} />
          <a href={`/api/certificates/${row.certificate.id}/pdf`}>PDF</a>
          <span className="figure text-sm">Original job {jobNumber(row.jobNumber)}</span>
        </div>
        {d ? (
          <div className="grid gap-3 text-sm md:grid-cols-3">
            <p>
              Term {formatDay(d.warranty.startsOn, { style: "compact" })} to {formatDay(d.warranty.endsOn, { style: "compact" })} (
              {d.warranty.termDays} days)
            </p>
            <p>Work: {d.work.map((w) => w.title).join("; ")}</p>
            <p>Parts: {d.parts.map((p) => `${p.title} × ${p.quantity}`).join("; ") || "none"}</p>
          </div>
        ) : (
          <p className="text-fail">This certificate cannot be verified: do not accept the claim on it.</p>
        )}
      </section>
      {undecided && can(viewer.role, "claim.decide") ? (
        <section className="card p-4" aria-labelledby="decide-h">
          <h2 id="decide-h" className="mb-2 font-semibold">
            Decide
          </h2>
          <DecisionForm claimId={row.claim.id} canInspect={row.claim.status === "open"} />
        </section>
      ) : (
        <section className="card space-y-1 p-4">
          <h2 className="font-semibold">Decision</h2>
          <p>{row.claim.decisionReason ?? "No message."}</p>
          {row.claim.warrantyJobId ? (
            <Notice tone="success" title="Warranty job opened">
              <Link href={`/bench/jobs/${row.claim.warrantyJobId}`}>Open the warranty job</Link>
            </Notice>
          ) : null}
        </section>
      )}
    </div>
  );
}
