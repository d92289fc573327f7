"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { Notice } from "@/components/ui/notice";
import { api } from "../../../_lib/api";
import { portalKeys } from "../../../_lib/query-keys";

// The owner takes back a request the shop has not started on. Two steps, so a stray click changes nothing.
export function WithdrawRequest({ jobId }: { jobId: string }) {
  const queryClient = useQueryClient();
  const [asking, setAsking] = useState(false);
  const [reason, setReason] = useState("");
  const withdraw = useMutation({
    mutationFn: () => api<{ state: string }>(`/api/portal/jobs/${jobId}/withdraw`, { method: "POST", body: { reason } }),
    onSuccess: () => {
      setAsking(false);
      void queryClient.invalidateQueries({ queryKey: portalKeys.job(jobId) });
    },
  });

  return (
    <section className="card space-y-3 p-5" aria-labelledby="withdraw-title">
      <h2 id="withdraw-title" className="text-xl font-bold">
        Changed your mind?
      </h2>
      <p>Until the shop starts on your request you can withdraw it. Nothing has been charged.</p>
      {asking ? (
        <form
          className="space-y-2"
          onSubmit={(e) => {
            e.preventDefault();
            withdraw.mutate();
          }}
        >
          <label htmlFor="withdraw-reason" className="field-label">
            Why (optional, the shop reads it)
          </label>
          <textarea
            id="withdraw-reason"
            rows={2}
            maxLength={1000}
            className="field-input"
            value={reason}
            onChange={(e) => setReason(e.target.value)}
          />
          <div className="flex flex-wrap gap-2">
            <button type="submit" className="btn-primary" disabled={withdraw.isPending}>
              {withdraw.isPending ? "Withdrawing…" : "Yes, withdraw my request"}
            </button>
            <button type="button" className="btn-secondary" onClick={() => setAsking(false)} disabled={withdraw.isPending}>
              Keep my request
            </button>
          </div>
        </form>
      ) : (
        <button type="button" className="btn-secondary" onClick={() => setAsking(true)}>
          Withdraw this request
        </button>
      )}
      {withdraw.isError ? (
        <Notice tone="error" live>
          <p>{withdraw.error.message}</p>
        </Notice>
      ) : null}
    </section>
  );
}
