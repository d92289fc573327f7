"use client";

import { useMutation } from "@tanstack/react-query";
import { Notice } from "@/components/ui/notice";
import { api } from "../../../_lib/api";

// Sends the payer to the hosted checkout. The amount is the server's; a second click reuses the same session.
export function PayButton({ jobId, purpose, amountText }: { jobId: string; purpose: "deposit" | "balance"; amountText: string }) {
  const start = useMutation({
    mutationFn: () =>
      api<{ kind: "redirect" | "confirming"; url: string }>("/api/payments/checkout", { method: "POST", body: { jobId, purpose } }),
    onSuccess: ({ url }) => window.location.assign(url),
  });
  const label = purpose === "deposit" ? `Pay the deposit of ${amountText}` : `Pay the balance of ${amountText}`;
  return (
    <section aria-labelledby="pay-title" className="card space-y-3 border-ember p-5">
      <h2 id="pay-title" className="text-xl font-bold">
        {purpose === "deposit" ? "Deposit due" : "Balance due"}: <span className="figure">{amountText}</span>
      </h2>
      <p>You pay on a secure payment page and come straight back here. Your card details never reach the shop.</p>
      {start.isError ? (
        <Notice tone="error" live title="The payment page did not open">
          <p>{start.error.message}</p>
        </Notice>
      ) : null}
      <button
        type="button"
        className="btn-primary px-6 py-3 text-base"
        disabled={start.isPending || start.isSuccess}
        onClick={() => start.mutate()}
      >
        {start.isPending || start.isSuccess ? "Opening the payment page…" : start.isError ? `Try again: ${label.toLowerCase()}` : label}
      </button>
    </section>
  );
}
