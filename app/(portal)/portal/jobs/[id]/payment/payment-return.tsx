"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { Notice } from "@/components/ui/notice";
import { api } from "../../../_lib/api";
import { portalKeys } from "../../../_lib/query-keys";

type Status = { status: "open" | "processing" | "paid" | "failed" | "expired"; purpose: "deposit" | "balance" };

export function PaymentReturn({ jobId, sessionId, paymentId }: { jobId: string; sessionId: string | null; paymentId: string | null }) {
  const key = sessionId ?? paymentId ?? "none";
  const query = useQuery({
    queryKey: portalKeys.paymentSession(key),
    queryFn: () => api<Status>(sessionId ? `/api/payments/session/${sessionId}` : `/api/payments/${paymentId}`),
    enabled: Boolean(sessionId ?? paymentId),
    refetchInterval: (q) =>
      q.state.data?.status === "paid" || q.state.data?.status === "failed" || q.state.data?.status === "expired" ? false : 1500,
    staleTime: 0,
  });
  const back = (
    <Link href={`/portal/jobs/${jobId}`} className="btn-secondary">
      Back to my job
    </Link>
  );
  const s = query.data;
  const what = s?.purpose === "balance" ? "balance" : "deposit";

  return (
    <div className="mx-auto max-w-prose space-y-6 py-6">
      <h1 className="text-3xl font-bold">Your payment</h1>
      {!sessionId && !paymentId ? (
        <Notice tone="error" title="We do not know which payment this is">
          <p>Open your job to see its payments.</p>
        </Notice>
      ) : query.isError ? (
        <Notice tone="error" live title="We could not check the payment">
          <p>{query.error.message}</p>
        </Notice>
      ) : s?.status === "paid" ? (
        <Notice tone="success" live title={s.purpose === "balance" ? "Paid in full — thank you" : "Deposit received — thank you"}>
          <p>The payment is confirmed and a receipt is on its way to your e-mail.</p>
        </Notice>
      ) : s?.status === "failed" || s?.status === "expired" ? (
        <Notice tone="error" live title="The payment did not go through">
          <p>Nothing was taken. You can try again from your job page with another card or method.</p>
        </Notice>
      ) : (
        <Notice tone="info" live title="Confirming your payment…">
          <p>
            {s?.status === "processing"
              ? `Your bank is confirming the ${what}. This can take a little while; we will e-mail you a receipt as soon as it is done. There is no need to pay again.`
              : `We are waiting for the payment service to confirm your ${what}. This usually takes a few seconds; please keep this page open.`}
          </p>
        </Notice>
      )}
      {back}
    </div>
  );
}
