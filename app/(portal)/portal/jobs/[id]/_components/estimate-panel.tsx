"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import dynamic from "next/dynamic";
import { useState } from "react";
import { Notice } from "@/components/ui/notice";
import type { PortalJobView } from "@/lib/server/services/portal-view";
import { api } from "../../../_lib/api";
import { portalKeys } from "../../../_lib/query-keys";

type Estimate = NonNullable<PortalJobView["estimate"]>;

const DeclineForm = dynamic(() => import("./decline-form"), {
  loading: () => <p className="text-sm text-bakelite-muted">Opening the form…</p>,
});

function minutes(n: number): string {
  if (!n) return "";
  const h = Math.floor(n / 60);
  const m = n % 60;
  return h ? `${h} h${m ? ` ${m} min` : ""}` : `${m} min`;
}

const STATUS_TEXT: Record<Estimate["status"], string> = {
  sent: "Waiting for your decision",
  approved: "Approved by you",
  declined: "Declined by you",
  superseded: "Replaced by a newer revision",
};

export function EstimatePanel({ jobId, estimate }: { jobId: string; estimate: Estimate }) {
  const queryClient = useQueryClient();
  const [declining, setDeclining] = useState(false);
  const refresh = () =>
    Promise.all([
      queryClient.invalidateQueries({ queryKey: portalKeys.job(jobId) }),
      queryClient.invalidateQueries({ queryKey: portalKeys.jobs() }),
    ]);

  const approve = useMutation({
    mutationFn: () => api(`/api/portal/jobs/${jobId}/estimate/approve`, { method: "POST", body: { revisionId: estimate.id } }),
    onSuccess: refresh,
  });
  const decline = useMutation({
    mutationFn: ({ reason, afterDecline }: { reason: string; afterDecline?: string }) =>
      api(`/api/portal/jobs/${jobId}/estimate/decline`, {
        method: "POST",
        body: { revisionId: estimate.id, reason, ...(afterDecline ? { afterDecline } : {}) },
      }),
    onSuccess: refresh,
  });

  return (
    <section aria-labelledby="estimate-title" className="space-y-5">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="estimate-title" className="text-2xl font-bold">
          Estimate{estimate.revision > 1 ? `, revision ${estimate.revision}` : ""}
        </h2>
        <p className="text-sm text-bakelite-muted">{STATUS_TEXT[estimate.status]}</p>
      </div>

      {estimate.revision > 1 && estimate.changeSummary ? (
        <Notice tone="info" title="What changed since the last estimate">
          <p className="whitespace-pre-line">{estimate.changeSummary}</p>
          {estimate.earlier[0] ? (
            <p>
              The previous total was {estimate.earlier[0].total.text}.{" "}
              {estimate.atBench
                ? "Your set stays on our bench. If you approve, the difference is settled in the balance when the work is done (or refunded if you have paid more than the new total)."
                : "This revision needs your approval before work goes on."}
            </p>
          ) : null}
        </Notice>
      ) : null}

      {estimate.groups.map((g) => (
        <div key={g.category} className="card overflow-hidden">
          <h3 className="border-b border-dial-rule bg-dial-deep px-4 py-2 text-lg font-bold">{g.label}</h3>
          <ul className="divide-y divide-dial-rule">
            {g.lines.map((l) => (
              <li key={l.id} className="grid gap-1 px-4 py-3 sm:grid-cols-[1fr_auto]">
                <div>
                  <p className="font-semibold">
                    {l.title}
                    {l.quantity > 1 ? <span className="font-normal text-bakelite-muted"> × {l.quantity}</span> : null}
                  </p>
                  {l.reason ? <p className="text-sm text-bakelite-soft">Why: {l.reason}</p> : null}
                  {l.minutes ? <p className="text-xs text-bakelite-muted">About {minutes(l.minutes * l.quantity)} of bench time</p> : null}
                </div>
                <div className="figure text-right text-sm sm:min-w-32">
                  {l.coveredByWarranty ? (
                    <span className="text-pass">
                      <span aria-hidden="true">✓ </span>No charge (warranty)
                    </span>
                  ) : (
                    <>
                      {l.labour.minor ? <p>Labour {l.labour.text}</p> : null}
                      {l.parts.minor ? <p>Parts {l.parts.text}</p> : null}
                    </>
                  )}
                </div>
              </li>
            ))}
          </ul>
        </div>
      ))}

      <div className="grid gap-5 md:grid-cols-2">
        <dl className="card figure space-y-1 p-5 text-base" aria-label="Totals">
          <div className="flex justify-between">
            <dt>Labour</dt>
            <dd>{estimate.labour.text}</dd>
          </div>
          {estimate.billing.rounding.minor ? (
            <div className="flex justify-between text-sm text-bakelite-soft">
              <dt>of which rounding up to the billing increment</dt>
              <dd>{estimate.billing.rounding.text}</dd>
            </div>
          ) : null}
          <div className="text-sm text-bakelite-soft" data-testid="estimate-billing-note">
            <dt className="sr-only">How labour is billed</dt>
            <dd>{estimate.billing.note}</dd>
          </div>
          <div className="flex justify-between">
            <dt>Parts</dt>
            <dd>{estimate.parts.text}</dd>
          </div>
          <div className="flex justify-between">
            <dt>
              Tax{estimate.labourTax.minor && estimate.partsTax.minor ? " (labour and parts)" : estimate.partsTax.minor ? " on parts" : ""}
            </dt>
            <dd>{estimate.tax.text}</dd>
          </div>
          <div className="flex justify-between border-t border-dial-rule pt-2 text-lg font-bold">
            <dt>Total</dt>
            <dd data-testid="estimate-total">{estimate.total.text}</dd>
          </div>
          {estimate.atBench ? (
            estimate.approvedTotal ? (
              <div className="flex justify-between text-bakelite-muted">
                <dt>Total you approved before</dt>
                <dd data-testid="estimate-approved-total">{estimate.approvedTotal.text}</dd>
              </div>
            ) : null
          ) : (
            <>
              <div className="flex justify-between font-semibold text-ember-dark">
                <dt>Deposit to start the work</dt>
                <dd data-testid="estimate-deposit">{estimate.deposit.text}</dd>
              </div>
              <div className="flex justify-between text-bakelite-muted">
                <dt>Balance when the set is finished</dt>
                <dd>{estimate.balanceAfterDeposit.text}</dd>
              </div>
            </>
          )}
        </dl>
        <div className="card space-y-2 p-5">
          <h3 className="text-lg font-bold">What the warranty will cover</h3>
          {estimate.warranty.termDays ? (
            <p>
              This is an estimate: the warranty comes with the finished work. When the set is returned you receive its certificate, a{" "}
              {estimate.warranty.termDays}-day {estimate.warranty.designation} warranty counted from the day after the return. It will
              cover:
            </p>
          ) : (
            <p>This shop does not offer a warranty on this work.</p>
          )}
          <ul className="list-disc space-y-1 pl-5 text-sm">
            {estimate.warranty.covers.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
          {estimate.warranty.excludes.length ? (
            <>
              <p className="pt-1 text-sm font-semibold">Not covered:</p>
              <ul className="list-disc space-y-1 pl-5 text-sm text-bakelite-soft">
                {estimate.warranty.excludes.map((c) => (
                  <li key={c}>{c}</li>
                ))}
              </ul>
            </>
          ) : null}
        </div>
      </div>

      {estimate.status === "declined" && estimate.declineReason ? (
        <p className="text-bakelite-soft">
          You declined this estimate: <q>{estimate.declineReason}</q>
        </p>
      ) : null}

      {estimate.decidable ? (
        <div className="card space-y-4 p-5">
          <h3 className="text-lg font-bold">Your decision</h3>
          {approve.isError || decline.isError ? (
            <Notice tone="error" live>
              <p>{(approve.error ?? decline.error)?.message}</p>
            </Notice>
          ) : null}
          {!declining ? (
            <div className="flex flex-wrap gap-3">
              <button
                type="button"
                className="btn-primary px-6 py-3 text-base"
                disabled={approve.isPending}
                onClick={() => approve.mutate()}
              >
                {approve.isPending
                  ? "Approving…"
                  : estimate.atBench
                    ? `Approve the change (new total ${estimate.total.text})`
                    : `Approve this estimate (${estimate.total.text})`}
              </button>
              <button type="button" className="btn-secondary px-6 py-3 text-base" onClick={() => setDeclining(true)}>
                Decline…
              </button>
            </div>
          ) : (
            <DeclineForm
              pending={decline.isPending}
              atBench={estimate.atBench}
              onDecline={(reason, afterDecline) => decline.mutate({ reason, afterDecline })}
              onBack={() => setDeclining(false)}
            />
          )}
          <p className="text-sm text-bakelite-muted">
            {estimate.atBench
              ? "Approving does not charge you now; the difference is settled with the balance."
              : "Approving does not charge you; the deposit is a separate step."}
          </p>
        </div>
      ) : null}

      {estimate.earlier.length ? (
        <details className="text-sm">
          <summary className="cursor-pointer">Earlier revisions</summary>
          <ul className="mt-2 space-y-1">
            {estimate.earlier.map((r) => (
              <li key={r.revision}>
                Revision {r.revision}: {r.total.text} — {STATUS_TEXT[r.status].toLowerCase()}
                {r.changeSummary ? ` (${r.changeSummary})` : ""}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </section>
  );
}
