"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { describedBy } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { ApiError, officeFetch } from "@/lib/client/office-api";
import { dayInZone } from "@/lib/engine/dates";
import { manualPaymentSchema, type ManualPaymentValues } from "@/lib/validation/office";
import type { Currency } from "./format";

type Answer = { paymentId: string; receiptId: string; receiptNumber: string; jobState: string; replayed: boolean };

const FIELDS = ["job", "amount", "method", "chequeNumber", "receivedOn"] as const;

function freshKey(): string {
  return crypto.randomUUID();
}

// Cash or a cheque handed over at the counter. The form carries a key made when it opens, so a second click
// or a resubmit after a lost answer records the payment once.
export function ManualPaymentForm({ currency }: { currency: Currency }) {
  const timeZone = useShopTimeZone();
  const router = useRouter();
  const [outcome, setOutcome] = useState<{ tone: "success" | "error"; text: string; receipt?: Answer } | null>(null);
  const blank = (): ManualPaymentValues => ({
    job: "",
    amount: "",
    method: "cash",
    chequeNumber: "",
    receivedOn: dayInZone(new Date(), timeZone),
    idempotencyKey: freshKey(),
  });
  const { register, handleSubmit, formState, setError, reset, control } = useForm<ManualPaymentValues>({
    resolver: zodResolver(manualPaymentSchema),
    defaultValues: blank(),
  });
  const { errors } = formState;
  const method = useWatch({ control, name: "method" });

  const record = useMutation({
    mutationFn: (values: ManualPaymentValues) => officeFetch<Answer>("/api/office/payments/manual", { method: "POST", json: values }),
    onSuccess: (r, v) => {
      setOutcome({
        tone: "success",
        text: `${v.method === "cash" ? "Cash" : "Cheque"} payment of ${currency.code} ${v.amount} for ${v.job.toUpperCase()} recorded${r.replayed ? " (it was already recorded; nothing was added)" : ""}.`,
        receipt: r,
      });
      reset(blank());
      router.refresh();
    },
    onError: (e) => {
      if (e instanceof ApiError && e.fields) {
        for (const [field, message] of Object.entries(e.fields))
          if ((FIELDS as readonly string[]).includes(field)) setError(field as (typeof FIELDS)[number], { type: "server", message });
      }
      setOutcome({
        tone: "error",
        text: e instanceof Error ? e.message : "The payment could not be recorded. Nothing was saved; try again.",
      });
    },
  });

  const input = (id: string, error: unknown, hint = false) => ({
    id,
    "aria-invalid": !!error,
    "aria-describedby": describedBy(id, { error, hint }),
  });

  return (
    <section aria-labelledby="manual-payment" className="card p-4">
      <h2 id="manual-payment" className="text-xl font-semibold">
        Record cash or a cheque
      </h2>
      <p className="text-sm text-bakelite-soft">
        Money handed over at the counter counts like an online payment and gets a numbered receipt. Take at most what is owed and give
        change for the rest.
      </p>
      <form
        noValidate
        className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-5"
        onSubmit={handleSubmit((v) => {
          setOutcome(null);
          record.mutate(v);
        })}
      >
        <div className="space-y-0.5">
          <label htmlFor="mp-job" className="field-label">
            Job
          </label>
          <input
            className="field-input figure"
            autoComplete="off"
            placeholder="KL-0042"
            {...input("mp-job", errors.job)}
            {...register("job")}
          />
          {errors.job ? (
            <p id="mp-job-error" className="field-error" role="alert">
              {errors.job.message}
            </p>
          ) : null}
        </div>
        <div className="space-y-0.5">
          <label htmlFor="mp-amount" className="field-label">
            Amount ({currency.code})
          </label>
          <input
            className="field-input figure"
            inputMode="decimal"
            autoComplete="off"
            {...input("mp-amount", errors.amount)}
            {...register("amount")}
          />
          {errors.amount ? (
            <p id="mp-amount-error" className="field-error" role="alert">
              {errors.amount.message}
            </p>
          ) : null}
        </div>
        <fieldset className="space-y-0.5">
          <legend className="field-label">Method</legend>
          <div className="flex gap-4 pt-1">
            <label className="flex items-center gap-1">
              <input type="radio" value="cash" {...register("method")} /> Cash
            </label>
            <label className="flex items-center gap-1">
              <input type="radio" value="cheque" {...register("method")} /> Cheque
            </label>
          </div>
          {errors.method ? (
            <p className="field-error" role="alert">
              {errors.method.message}
            </p>
          ) : null}
        </fieldset>
        <div className="space-y-0.5">
          <label htmlFor="mp-cheque" className="field-label">
            Cheque number
          </label>
          <input
            className="field-input figure"
            autoComplete="off"
            disabled={method !== "cheque"}
            {...input("mp-cheque", errors.chequeNumber, true)}
            {...register("chequeNumber")}
          />
          <p id="mp-cheque-hint" className="field-hint">
            Optional; for a cheque.
          </p>
          {errors.chequeNumber ? (
            <p id="mp-cheque-error" className="field-error" role="alert">
              {errors.chequeNumber.message}
            </p>
          ) : null}
        </div>
        <div className="space-y-0.5">
          <label htmlFor="mp-received" className="field-label">
            Paid on
          </label>
          <input type="date" className="field-input figure" {...input("mp-received", errors.receivedOn)} {...register("receivedOn")} />
          {errors.receivedOn ? (
            <p id="mp-received-error" className="field-error" role="alert">
              {errors.receivedOn.message}
            </p>
          ) : null}
        </div>
        <div className="sm:col-span-2 lg:col-span-5">
          <button type="submit" className="btn-primary" disabled={record.isPending}>
            {record.isPending ? "Recording…" : "Record payment"}
          </button>
        </div>
      </form>
      {outcome ? (
        <div className="mt-3">
          <Notice tone={outcome.tone} live>
            <p>{outcome.text}</p>
            {outcome.receipt ? (
              <p>
                <a href={`/api/documents/${outcome.receipt.receiptId}/pdf`} download>
                  Download receipt <span className="figure">{outcome.receipt.receiptNumber}</span> (PDF)
                </a>
              </p>
            ) : null}
          </Notice>
        </div>
      ) : null}
    </section>
  );
}
