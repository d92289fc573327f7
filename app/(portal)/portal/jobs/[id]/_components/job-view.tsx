"use client";

import type { ReactNode } from "react";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { Notice } from "@/components/ui/notice";
import { WAIVED_WORDING } from "@/lib/engine/pricing/wording";
import type { PortalJobView } from "@/lib/server/services/portal-view";
import { QueueForecast } from "./queue-forecast";
import { api } from "../../../_lib/api";
import { portalKeys } from "../../../_lib/query-keys";
import { EstimatePanel } from "./estimate-panel";
import { MessageThread } from "./message-thread";
import { PayButton } from "./pay-button";
import { WithdrawRequest } from "./withdraw-request";
import { ReturnAddress } from "./return-address";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDateTime } from "@/lib/engine/dates";

const NEXT_STEP: Partial<Record<PortalJobView["job"]["state"], string>> = {
  requested: "A technician will read your request and look at the photos. You will hear from us by e-mail.",
  in_triage: "A technician is reviewing your set and writing the estimate.",
  awaiting_owner: "The shop has asked you a question below. Your answer lets us finish the estimate.",
  estimate_sent: "Your estimate is ready. Read it below, then approve it or tell us why not.",
  approved: "Thank you for approving. The deposit below lets us reserve bench time and order parts.",
  deposit_paid: "Deposit received. Please send or bring the set: remove batteries, wrap the chassis and the dial glass well.",
  on_bench: "Your set is on the bench. We will write if anything changes.",
  bench_revision:
    "While working on your set we found something that changes the work. Your set stays on our bench: read the change below, then approve it or tell us how to go on.",
  final_checks: "The work is done; the final measurements are being checked.",
  balance_due: "Your set is finished. Once the balance is paid, we return it.",
  paid_in_full: "Paid in full. We are making the set ready to go back to you; we write as soon as it is collected or shipped.",
  returned: "Your set is back with you. Its warranty certificate is below: keep the PDF, and show its code to a later buyer.",
};

// A shipped set is with the carrier, not yet with its owner.
const SHIPPED_STEP =
  "Your set is on its way back to you with the carrier. Its warranty certificate is below: keep the PDF, and show its code to a later buyer.";

// Owners may live far from the shop: times are the shop's, with its zone named.
function when(iso: string, timeZone: string): string {
  return formatDateTime(iso, { timeZone, showZone: true });
}

// `initial` is the same view loaded by the page on the server, so the job shows in the first HTML
// instead of after the scripts and a second round trip; the query keeps it fresh from then on.
export function JobView({
  jobId,
  initial,
  justCreated,
  paymentCancelled,
  certificates,
}: {
  jobId: string;
  initial: PortalJobView;
  justCreated: boolean;
  paymentCancelled: boolean;
  certificates?: ReactNode;
}) {
  const timeZone = useShopTimeZone();
  const query = useQuery({
    queryKey: portalKeys.job(jobId),
    queryFn: () => api<PortalJobView>(`/api/portal/jobs/${jobId}`),
    initialData: initial,
  });

  if (query.isError) {
    return (
      <Notice tone="error" live title="We could not load this job">
        <p>{query.error.message}</p>
        <button type="button" className="btn-secondary mt-2" onClick={() => void query.refetch()}>
          Try again
        </button>
      </Notice>
    );
  }
  const v = query.data;
  const setName = `${v.job.set.maker} ${v.job.set.model}`;

  return (
    <div className="space-y-8">
      <p>
        <Link href="/portal">← All my sets</Link>
      </p>
      <header className="space-y-2">
        <p className="figure text-sm text-bakelite-muted">
          {v.job.number}
          {v.job.isWarranty ? " · warranty job" : ""}
        </p>
        <h1 className="text-3xl font-bold">
          {setName}
          {v.job.set.year ? <span className="font-normal text-bakelite-soft"> ({v.job.set.year})</span> : null}
        </h1>
        <p
          className="inline-flex items-center gap-2 rounded-full border border-bakelite-soft bg-white px-3 py-1 font-semibold"
          data-testid="job-state"
        >
          <span aria-hidden="true">{v.job.stateIcon}</span>
          {v.job.stateLabel}
        </p>
      </header>

      {justCreated ? (
        <Notice tone="success" live title="Your request is with the shop">
          <p>We have e-mailed you a copy. Please do not ship the set yet: wait for the estimate.</p>
        </Notice>
      ) : null}
      {paymentCancelled ? (
        <Notice tone="info" live title="Payment not made">
          <p>You left the payment page before paying. Nothing was charged; you can pay whenever you are ready.</p>
        </Notice>
      ) : null}

      {NEXT_STEP[v.job.state] ? (
        <section className="card p-5" aria-labelledby="next-title">
          <h2 id="next-title" className="text-xl font-bold">
            What happens next
          </h2>
          <p className="mt-1 text-lg">
            {v.job.state === "deposit_paid" && v.account.paid.minor === 0
              ? "Nothing to pay before the work. Please send or bring the set: remove batteries, wrap the chassis and the dial glass well."
              : v.job.state === "returned" && v.job.returnMethod === "shipped"
                ? SHIPPED_STEP
                : NEXT_STEP[v.job.state]}
          </p>
          {v.job.state === "returned" && v.job.returnMethod === "shipped" && v.job.trackingNumber ? (
            <p className="mt-1">
              Shipped with {v.job.carrier ?? "the carrier"}, tracking number <span className="figure">{v.job.trackingNumber}</span>.
            </p>
          ) : null}
          <QueueForecast forecast={v.forecast} />
        </section>
      ) : null}

      {v.job.state === "deposit_paid" && v.job.delivery === "mail-in" ? (
        <p data-testid="send-in-return-note">
          {v.job.returnAddress
            ? "When the work is done, the set comes back to the address below."
            : "Before you send the set, tell us below where it should come back to."}
        </p>
      ) : null}
      <ReturnAddress jobId={jobId} job={v.job} />
      {v.job.state === "requested" ? <WithdrawRequest jobId={jobId} /> : null}
      {v.job.state === "cancelled" ? (
        <Notice tone="info" title="This request is closed">
          <p>It was withdrawn or cancelled; the messages below say why. You can send a new request whenever you like.</p>
        </Notice>
      ) : null}

      {certificates}

      {v.confirming ? (
        <Notice tone="info" live title="Confirming your payment">
          <p>Your payment is on its way to us. This page updates once the bank confirms it; there is no need to pay again.</p>
        </Notice>
      ) : null}
      {v.due ? <PayButton jobId={jobId} purpose={v.due.purpose} amountText={v.due.amount.text} /> : null}
      {v.account.owedBack.minor > 0 ? (
        <Notice tone="info" title="We owe you money back">
          <p data-testid="owed-back">
            You have paid {v.account.owedBack.text} more than{" "}
            {v.account.reduced.minor > 0 ? `the reduced price of ${v.account.price.text}` : `the total of ${v.account.total.text}`}. The
            shop will refund it to the card you paid with.
          </p>
        </Notice>
      ) : null}
      {v.account.waived ? (
        <Notice tone="info" title="A small remainder was waived">
          <p data-testid="account-waived">
            {v.account.waived.text} {WAIVED_WORDING}: the shop does not ask for it, and nothing is left to pay.
          </p>
        </Notice>
      ) : null}
      {v.account.total.minor > 0 || v.account.paid.minor > 0 ? (
        <dl
          className="card figure grid grid-cols-2 gap-x-6 gap-y-1 p-5 sm:grid-cols-4"
          aria-label="Your account for this job"
          data-testid="account"
        >
          <div>
            <dt className="text-sm text-bakelite-muted">Total</dt>
            <dd>{v.account.total.text}</dd>
          </div>
          {v.account.reduced.minor > 0 ? (
            <div>
              <dt className="text-sm text-bakelite-muted">Price reduced by</dt>
              <dd data-testid="account-reduced">
                {v.account.reduced.text}
                <span className="block text-xs text-bakelite-muted">given back to you; not to be paid again</span>
              </dd>
            </div>
          ) : null}
          <div>
            <dt className="text-sm text-bakelite-muted">Paid</dt>
            <dd>{v.account.paid.text}</dd>
          </div>
          <div>
            <dt className="text-sm text-bakelite-muted">Refunded</dt>
            <dd>
              {v.account.refunded.text}
              {v.account.refundPending.minor > 0 ? ` (+ ${v.account.refundPending.text} on its way)` : ""}
            </dd>
          </div>
          <div>
            <dt className="text-sm text-bakelite-muted">{v.account.owedBack.minor > 0 ? "Owed back to you" : "Still to pay"}</dt>
            <dd data-testid="account-owed">{v.account.owedBack.minor > 0 ? v.account.owedBack.text : v.account.owed.text}</dd>
          </div>
        </dl>
      ) : null}

      {v.account.belowMinimum ? (
        <p className="text-sm" data-testid="below-minimum">
          {v.account.owed.text} is below the smallest card payment: it is not asked for online, and the shop waives it when the work is
          done.
        </p>
      ) : null}
      {v.estimate ? <EstimatePanel jobId={jobId} estimate={v.estimate} /> : null}

      {v.payments.length ? (
        <section aria-labelledby="payments-title" className="space-y-2">
          <h2 id="payments-title" className="text-2xl font-bold">
            Payments
          </h2>
          <ul className="card divide-y divide-dial-rule">
            {v.payments.map((p) => (
              <li key={p.id} className="flex flex-wrap items-center justify-between gap-2 p-4" data-testid={`payment-${p.purpose}`}>
                <span className="font-semibold">{p.purpose === "deposit" ? "Deposit" : "Balance"}</span>
                <span className="figure">{p.amount.text}</span>
                <span>
                  {p.status === "paid" ? (
                    <span className="text-pass">
                      <span aria-hidden="true">✓ </span>Paid{p.paidAt ? ` on ${when(p.paidAt, timeZone)}` : ""}
                    </span>
                  ) : p.status === "duplicate" ? (
                    <span>
                      <span aria-hidden="true">⧉ </span>Paid twice — the shop gives this one back
                    </span>
                  ) : p.status === "processing" ? (
                    <span>
                      <span aria-hidden="true">◔ </span>Being confirmed
                    </span>
                  ) : (
                    <span className="text-fail">
                      <span aria-hidden="true">✕ </span>Did not go through
                    </span>
                  )}
                  {p.refunded.minor > 0 ? <span className="ml-2 text-bakelite-muted">({p.refunded.text} refunded)</span> : null}
                </span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      <MessageThread jobId={jobId} />

      <section aria-labelledby="photos-title" className="space-y-3">
        <h2 id="photos-title" className="text-2xl font-bold">
          Photos
        </h2>
        {v.photos.length ? (
          <ul className="grid grid-cols-2 gap-3 sm:grid-cols-4">
            {v.photos.map((p) => (
              <li key={p.id}>
                <a href={p.url} target="_blank" rel="noreferrer" className="block">
                  {/* eslint-disable-next-line @next/next/no-img-element -- photos come re-encoded from our own authorised route; the image optimiser would fetch them without the session */}
                  <img
                    src={p.thumbUrl}
                    alt={`Photo: ${p.name}`}
                    className="aspect-square w-full rounded-card border border-dial-rule object-cover"
                  />
                </a>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-bakelite-muted">No photos on this job.</p>
        )}
      </section>

      <section aria-labelledby="about-title" className="card space-y-3 p-5">
        <h2 id="about-title" className="text-xl font-bold">
          What you told us
        </h2>
        <div>
          <h3 className="text-sm font-semibold">What is wrong</h3>
          <p className="whitespace-pre-line">{v.job.symptoms}</p>
        </div>
        {v.job.priorWork ? (
          <div>
            <h3 className="text-sm font-semibold">Earlier work</h3>
            <p className="whitespace-pre-line">{v.job.priorWork}</p>
          </div>
        ) : null}
        <p className="text-sm text-bakelite-muted">
          {v.job.delivery === "mail-in" ? "Mail-in" : "Drop-off at the shop"}
          {v.job.set.serial ? ` · serial ${v.job.set.serial}` : ""}
        </p>
      </section>

      <section aria-labelledby="timeline-title" className="space-y-3">
        <h2 id="timeline-title" className="text-2xl font-bold">
          Timeline
        </h2>
        <ol className="space-y-2 border-l-2 border-dial-rule pl-5">
          {v.timeline.map((t) => (
            <li key={t.id}>
              <span aria-hidden="true" className="mr-2">
                {t.icon}
              </span>
              <span className="font-semibold">{t.label}</span>
              <span className="ml-2 text-sm text-bakelite-muted">{when(t.at, timeZone)}</span>
            </li>
          ))}
        </ol>
      </section>
    </div>
  );
}
