"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { describedBy } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { TableScroll } from "@/components/ui/table-scroll";
import type { getPaymentForOffice } from "@/db/queries/office";
import { jobNumber } from "@/lib/engine/jobs/states";
import { refundFormSchema, type RefundFormValues } from "@/lib/validation/office";
import { ApiError, officeFetch } from "@/lib/client/office-api";
import { formatMoney, formatWhen, type Currency, type Jsonify } from "./format";
import { formatDay } from "@/lib/engine/dates";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { METHOD_LABEL, PAYMENT_STATUS_LABEL, PURPOSE_LABEL, REFUND_STATUS_LABEL } from "./labels";
import { officeKeys } from "@/lib/client/office-query-keys";

export type PaymentDetail = Jsonify<NonNullable<Awaited<ReturnType<typeof getPaymentForOffice>>>>;
type RefundAnswer = { refundId: string; amountMinor: number; status: keyof typeof REFUND_STATUS_LABEL };

// A refund asked for and not settled either way yet.
const OPEN = new Set<string>(["requested", "pending"]);

export function RefundPanel({ initial, currency }: { initial: PaymentDetail; currency: Currency }) {
  const timeZone = useShopTimeZone();
  const queryClient = useQueryClient();
  const key = officeKeys.payment(initial.id);
  // The refund just asked for, until the processor's webhook has settled it.
  const [awaiting, setAwaiting] = useState<string | null>(null);
  const { data: payment = initial } = useQuery({
    queryKey: key,
    queryFn: () => officeFetch<PaymentDetail>(`/api/office/payments/${initial.id}`),
    initialData: initial,
    // A requested refund is settled by the processor's webhook; look again until it is.
    refetchInterval: (q) => {
      const refunds = q.state.data?.refunds ?? [];
      const waiting =
        refunds.some((r) => OPEN.has(r.status)) || (awaiting !== null && !refunds.some((r) => r.id === awaiting && !OPEN.has(r.status)));
      return waiting ? 1500 : false;
    },
    refetchIntervalInBackground: true,
  });
  const [outcome, setOutcome] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  // A refund cannot be undone: the form asks, then this names what will happen and waits for a yes.
  const [confirming, setConfirming] = useState<RefundFormValues | null>(null);
  const left = payment.amountMinor - payment.refundedMinor - payment.inFlightMinor;
  // Cash and cheques go back over the counter, not through the processor: an entry made by mistake is voided.
  const refundable = payment.method === "card" && (payment.status === "paid" || payment.status === "duplicate") && left > 0;

  const { register, handleSubmit, formState, setError, reset } = useForm<RefundFormValues>({
    resolver: zodResolver(refundFormSchema),
    // No kind is chosen for the office: a return and a price reduction mean different things for the account.
    defaultValues: { amount: "", reason: "" },
  });
  const { errors } = formState;

  const refund = useMutation({
    mutationFn: (values: RefundFormValues) =>
      officeFetch<RefundAnswer>(`/api/office/payments/${payment.id}/refunds`, {
        method: "POST",
        json: values,
      }),
    onSuccess: (r) => {
      setAwaiting(r.refundId);
      setOutcome(
        r.status === "pending"
          ? {
              tone: "error",
              text: `The processor did not answer in time about the refund of ${formatMoney(r.amountMinor, currency)}. It is pending: it may already have been made, so do not refund it again. Bandedge checks with the processor and shows the outcome here.`,
            }
          : {
              tone: "success",
              text: `Refund of ${formatMoney(r.amountMinor, currency)} sent to the processor. It shows as refunded once the processor confirms it.`,
            },
      );
      reset({ amount: "", reason: "" });
    },
    onError: (e) => {
      if (e instanceof ApiError && e.fields) {
        for (const [field, message] of Object.entries(e.fields))
          if (field === "amount" || field === "reason" || field === "kind") setError(field, { type: "server", message });
      }
      setOutcome({
        tone: "error",
        text: e instanceof Error ? e.message : "The refund could not be started. Nothing was refunded; try again.",
      });
    },
    onSettled: () => {
      void queryClient.invalidateQueries({ queryKey: key, exact: true });
      void queryClient.invalidateQueries({ queryKey: officeKeys.payments(), exact: true });
    },
  });

  // Reads an open refund back from the processor (or asks again with the same idempotency key).
  const check = useMutation({
    mutationFn: (refundId: string) => officeFetch<RefundAnswer>(`/api/office/refunds/${refundId}/check`, { method: "POST" }),
    onSuccess: (r) =>
      setOutcome(
        OPEN.has(r.status)
          ? { tone: "error", text: "The processor has not settled this refund yet. It stays pending; Bandedge keeps checking." }
          : { tone: "success", text: `The processor says: ${REFUND_STATUS_LABEL[r.status].text.toLowerCase()}.` },
      ),
    onError: (e) => setOutcome({ tone: "error", text: e instanceof Error ? e.message : "The processor could not be asked. Try again." }),
    onSettled: () => void queryClient.invalidateQueries({ queryKey: key, exact: true }),
  });

  const status = PAYMENT_STATUS_LABEL[payment.status];
  return (
    <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
      <div className="space-y-6">
        <section aria-labelledby="payment-facts" className="card p-5">
          <h2 id="payment-facts" className="text-xl font-semibold">
            {PURPOSE_LABEL[payment.purpose]} for job {jobNumber(payment.jobNumber)}
          </h2>
          <p className="text-sm text-bakelite-soft">
            {payment.maker} {payment.model} · {payment.customerName}
          </p>
          <dl className="mt-4 grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-3">
            <div>
              <dt className="text-bakelite-muted">Amount</dt>
              <dd className="figure text-lg">{formatMoney(payment.amountMinor, currency)}</dd>
            </div>
            <div>
              <dt className="text-bakelite-muted">Status</dt>
              <dd>
                <span aria-hidden="true">{status.icon} </span>
                {status.text}
              </dd>
            </div>
            <div>
              <dt className="text-bakelite-muted">Paid at</dt>
              <dd className="figure">{formatWhen(payment.paidAt, timeZone)}</dd>
            </div>
            <div>
              <dt className="text-bakelite-muted">Method</dt>
              <dd>
                {METHOD_LABEL[payment.method]}
                {payment.chequeNumber ? <span className="figure"> no. {payment.chequeNumber}</span> : null}
                {payment.receivedOn ? (
                  <span className="block text-xs text-bakelite-muted">received {formatDay(payment.receivedOn, { style: "compact" })}</span>
                ) : null}
              </dd>
            </div>
            <div>
              <dt className="text-bakelite-muted">Receipt</dt>
              <dd>
                {payment.receiptId ? (
                  <a href={`/api/documents/${payment.receiptId}/pdf`} download>
                    <span className="figure">{payment.receiptNumber}</span> (PDF)
                  </a>
                ) : payment.status === "paid" || payment.status === "duplicate" ? (
                  // Money received before receipts were numbered has none; saying "when the money is in" would be untrue.
                  "None — received before receipts were issued"
                ) : (
                  "None yet — issued when the money is in"
                )}
              </dd>
            </div>
            <div>
              <dt className="text-bakelite-muted">Refunded so far</dt>
              <dd className="figure" data-testid="refunded-so-far">
                {formatMoney(payment.refundedMinor, currency)}
              </dd>
            </div>
            <div>
              <dt className="text-bakelite-muted">Waiting for the processor</dt>
              <dd className="figure">{formatMoney(payment.inFlightMinor, currency)}</dd>
            </div>
            <div>
              <dt className="text-bakelite-muted">Left to refund</dt>
              <dd className="figure">{formatMoney(Math.max(left, 0), currency)}</dd>
            </div>
          </dl>
        </section>

        <section aria-labelledby="refund-history" className="card p-5">
          <h2 id="refund-history" className="mb-2 text-xl font-semibold">
            Refunds
          </h2>
          {payment.refunds.length === 0 ? (
            <p className="text-sm text-bakelite-soft">No refunds on this payment.</p>
          ) : (
            <TableScroll label="Refunds">
              <table className="dense-table">
                <thead>
                  <tr>
                    <th scope="col">Asked</th>
                    <th scope="col" className="text-right">
                      Amount
                    </th>
                    <th scope="col">Status</th>
                    <th scope="col">Kind</th>
                    <th scope="col">Reason</th>
                    <th scope="col">By</th>
                  </tr>
                </thead>
                <tbody>
                  {payment.refunds.map((r) => (
                    <tr key={r.id}>
                      <td className="figure whitespace-nowrap">{formatWhen(r.createdAt, timeZone)}</td>
                      <td className="figure whitespace-nowrap text-right">{formatMoney(r.amountMinor, currency)}</td>
                      <td>
                        <span aria-hidden="true">{REFUND_STATUS_LABEL[r.status].icon} </span>
                        {REFUND_STATUS_LABEL[r.status].text}
                        {r.settledAt ? (
                          <span className="block text-xs text-bakelite-muted">{formatWhen(r.settledAt, timeZone)}</span>
                        ) : null}
                        {r.noteId ? (
                          <a className="block text-xs" href={`/api/documents/${r.noteId}/pdf`} download>
                            {r.kind === "reduction" ? "Price reduction note" : "Refund note"} <span className="figure">{r.noteNumber}</span>{" "}
                            (PDF)
                          </a>
                        ) : null}
                        {r.status === "pending" ? (
                          <button
                            type="button"
                            className="btn-secondary mt-1 block text-xs"
                            disabled={check.isPending}
                            onClick={() => check.mutate(r.id)}
                          >
                            Check with the processor
                          </button>
                        ) : null}
                      </td>
                      <td>{r.kind === "reduction" ? "Price reduction" : "Money back"}</td>
                      <td className="max-w-xs whitespace-pre-wrap break-words">{r.reason}</td>
                      <td>{r.createdByName ?? "—"}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </TableScroll>
          )}
        </section>
      </div>

      <section aria-labelledby="refund-form" className="card h-fit p-5">
        <h2 id="refund-form" className="text-xl font-semibold">
          Refund
        </h2>
        {refundable ? (
          <form
            noValidate
            className="mt-3 space-y-3"
            onSubmit={handleSubmit((v) => {
              setOutcome(null);
              setConfirming(v);
            })}
          >
            <div className="space-y-0.5">
              <label htmlFor="refund-amount" className="field-label">
                Amount to refund ({currency.code})
              </label>
              <input
                id="refund-amount"
                inputMode="decimal"
                autoComplete="off"
                className="field-input figure"
                aria-invalid={!!errors.amount}
                aria-describedby={describedBy("refund-amount", { hint: true, error: errors.amount })}
                {...register("amount")}
              />
              <p id="refund-amount-hint" className="field-hint">
                Up to {formatMoney(left, currency)}. Part of the payment may be refunded.
              </p>
              {errors.amount ? (
                <p id="refund-amount-error" className="field-error" role="alert">
                  {errors.amount.message}
                </p>
              ) : null}
            </div>
            <fieldset className="space-y-2" aria-describedby={describedBy("refund-kind", { hint: true, error: errors.kind })}>
              <legend className="field-label">What this refund is</legend>
              <div className="flex items-start gap-2">
                <input id="refund-kind-return" type="radio" value="return" className="mt-1 h-4 w-4" {...register("kind")} />
                <label htmlFor="refund-kind-return" className="text-sm">
                  Give back money paid beyond the total
                </label>
              </div>
              <div className="flex items-start gap-2">
                <input id="refund-kind-reduction" type="radio" value="reduction" className="mt-1 h-4 w-4" {...register("kind")} />
                <label htmlFor="refund-kind-reduction" className="text-sm">
                  Lower the price (goodwill) and give that back
                </label>
              </div>
              <p id="refund-kind-hint" className="field-hint">
                A duplicate charge, an over-payment or a cancelled job is money paid beyond the total: the price stands. A goodwill refund
                (a scratch, something knocked off) lowers the price, so the owner is not asked to pay it again.
              </p>
              {errors.kind ? (
                <p id="refund-kind-error" className="field-error" role="alert">
                  {errors.kind.message}
                </p>
              ) : null}
            </fieldset>
            <div className="space-y-0.5">
              <label htmlFor="refund-reason" className="field-label">
                Reason
              </label>
              <textarea
                id="refund-reason"
                rows={3}
                className="field-input"
                aria-invalid={!!errors.reason}
                aria-describedby={describedBy("refund-reason", { hint: true, error: errors.reason })}
                {...register("reason")}
              />
              <p id="refund-reason-hint" className="field-hint">
                Kept in the audit log with your name.
              </p>
              {errors.reason ? (
                <p id="refund-reason-error" className="field-error" role="alert">
                  {errors.reason.message}
                </p>
              ) : null}
            </div>
            <button type="submit" className="btn-primary w-full" disabled={refund.isPending || confirming !== null}>
              {refund.isPending ? "Sending to the processor…" : "Refund this amount"}
            </button>
            {confirming ? (
              <div role="alertdialog" aria-labelledby="refund-confirm" className="space-y-2 rounded-card border border-fail p-3">
                <p id="refund-confirm" className="text-sm">
                  Refund {currency.code} {confirming.amount} of {payment.customerName}&apos;s payment for job {jobNumber(payment.jobNumber)}
                  {confirming.kind === "reduction" ? ", lowering the price by that amount" : ", giving back money paid beyond the total"}? A
                  refund cannot be undone. We e-mail {payment.customerName} that it is on its way.
                </p>
                <div className="flex flex-wrap gap-2">
                  <button
                    type="button"
                    className="btn-primary"
                    onClick={() => {
                      refund.mutate(confirming);
                      setConfirming(null);
                    }}
                  >
                    Yes, refund {currency.code} {confirming.amount}
                  </button>
                  <button type="button" className="btn-quiet" onClick={() => setConfirming(null)}>
                    Cancel
                  </button>
                </div>
              </div>
            ) : null}
          </form>
        ) : (
          <p className="mt-2 text-sm text-bakelite-soft">
            {payment.status !== "paid" && payment.status !== "duplicate"
              ? "Only a received payment can be refunded."
              : "Everything paid has been refunded or is waiting for the processor."}
          </p>
        )}
        {outcome ? (
          <div className="mt-3">
            <Notice tone={outcome.tone} live>
              <p>{outcome.text}</p>
            </Notice>
          </div>
        ) : null}
      </section>
    </div>
  );
}
