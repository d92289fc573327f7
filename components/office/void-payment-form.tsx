"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { describedBy } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { ApiError, officeFetch } from "@/lib/client/office-api";
import { officeKeys } from "@/lib/client/office-query-keys";
import { voidPaymentSchema, type VoidPaymentValues } from "@/lib/validation/office";

// A cash or cheque entry made by mistake is voided, never deleted: it stops counting and stays on record.
export function VoidPaymentForm({ paymentId }: { paymentId: string }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [outcome, setOutcome] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const { register, handleSubmit, formState, setError } = useForm<VoidPaymentValues>({
    resolver: zodResolver(voidPaymentSchema),
    defaultValues: { reason: "" },
  });
  const { errors } = formState;
  const mutation = useMutation({
    mutationFn: (v: VoidPaymentValues) => officeFetch(`/api/office/payments/${paymentId}/void`, { method: "POST", json: v }),
    onSuccess: () => {
      setOutcome({ tone: "success", text: "The entry is voided: it no longer counts, and its receipt now reads VOID." });
      void queryClient.invalidateQueries({ queryKey: officeKeys.payment(paymentId), exact: true });
      router.refresh();
    },
    onError: (e) => {
      if (e instanceof ApiError && e.fields?.reason) setError("reason", { type: "server", message: e.fields.reason });
      setOutcome({ tone: "error", text: e instanceof Error ? e.message : "The entry could not be voided. Nothing changed; try again." });
    },
  });
  return (
    <section aria-labelledby="void-payment" className="card p-5">
      <h2 id="void-payment" className="text-xl font-semibold">
        Entered by mistake?
      </h2>
      <form noValidate className="mt-3 space-y-3" onSubmit={handleSubmit((v) => mutation.mutate(v))}>
        <div className="space-y-0.5">
          <label htmlFor="void-reason" className="field-label">
            Reason
          </label>
          <textarea
            id="void-reason"
            rows={2}
            className="field-input"
            aria-invalid={!!errors.reason}
            aria-describedby={describedBy("void-reason", { hint: true, error: errors.reason })}
            {...register("reason")}
          />
          <p id="void-reason-hint" className="field-hint">
            Kept in the audit log with your name. Only while the job still waits for this money.
          </p>
          {errors.reason ? (
            <p id="void-reason-error" className="field-error" role="alert">
              {errors.reason.message}
            </p>
          ) : null}
        </div>
        <button type="submit" className="btn-secondary" disabled={mutation.isPending}>
          Void this entry
        </button>
      </form>
      {outcome ? (
        <div className="mt-3">
          <Notice tone={outcome.tone} live>
            <p>{outcome.text}</p>
          </Notice>
        </div>
      ) : null}
    </section>
  );
}
