"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { Notice } from "@/components/ui/notice";
import { api, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { formatMinor } from "@/lib/engine/pricing/money";

type CancelAnswer = {
  account: { paidMinor: number; refundedMinor: number; refundPendingMinor: number; owedBackMinor: number };
  refunds: { paymentId: string; amountMinor: number; outcome: string; message?: string }[];
  owedBackMinor: number;
};

// The shop owner calls a job off before the bench; what the shop holds is refunded or shown as owed back.
export function CancelJobPanel({ jobId, cancelled }: { jobId: string; cancelled: boolean }) {
  const queryClient = useQueryClient();
  const [reason, setReason] = useState("");
  const [refund, setRefund] = useState(true);
  const cancel = useMutation({
    mutationFn: () => api<CancelAnswer>(`/api/bench/jobs/${jobId}/cancel`, { method: "POST", body: { reason, refund } }),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: benchKeys.job(jobId) }),
  });
  const money = (minor: number) => formatMinor(minor, 2);
  // Once cancelled, the panel stays only to show what this cancellation did (money owed back, refunds).
  if (cancelled && !cancel.data) return null;

  return (
    <details className="card p-3 text-sm" open={cancelled || undefined}>
      <summary className="cursor-pointer font-semibold">Cancel this job</summary>
      <form
        hidden={cancelled}
        className="mt-2 space-y-2"
        onSubmit={(e) => {
          e.preventDefault();
          cancel.mutate();
        }}
      >
        <p>The set is not on the bench yet. Cancelling closes the job; any deposit paid is owed back to the owner.</p>
        <label htmlFor="cancel-reason" className="field-label">
          Why (the owner reads it)
        </label>
        <textarea id="cancel-reason" rows={2} className="field-input" value={reason} onChange={(e) => setReason(e.target.value)} />
        <label className="flex items-center gap-2">
          <input type="checkbox" checked={refund} onChange={(e) => setRefund(e.target.checked)} />
          Refund what is owed back now
        </label>
        <button type="submit" className="btn-secondary" disabled={cancel.isPending}>
          {cancel.isPending ? "Cancelling…" : "Cancel the job"}
        </button>
      </form>
      {cancel.isError ? (
        <Notice tone="error" live>
          <p>{errorText(cancel.error)}</p>
        </Notice>
      ) : null}
      {cancel.data ? (
        <Notice tone="success" live title="Job cancelled">
          <p>
            Paid {money(cancel.data.account.paidMinor)}; refunds asked for {money(cancel.data.account.refundPendingMinor)}; refunded{" "}
            {money(cancel.data.account.refundedMinor)}; still owed back {money(cancel.data.owedBackMinor)}.
          </p>
          {cancel.data.refunds
            .filter((r) => r.message)
            .map((r) => (
              <p key={r.paymentId}>{r.message}</p>
            ))}
        </Notice>
      ) : null}
    </details>
  );
}
