"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { Notice } from "@/components/ui/notice";
import { returnFormSchema, type ReturnInput } from "@/lib/validation/bench";
import { moneyText } from "@/lib/validation/estimate";
import { api, ApiError, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import type { BenchSheetJson, JobDetailJson } from "./types";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDate } from "@/lib/engine/dates";

type ReturnForm = z.input<typeof returnFormSchema>;

function useStateChange(jobId: string) {
  const qc = useQueryClient();
  return () => {
    void qc.invalidateQueries({ queryKey: benchKeys.job(jobId) });
    void qc.invalidateQueries({ queryKey: benchKeys.queues() });
    void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) });
    void qc.invalidateQueries({ queryKey: benchKeys.estimate(jobId) });
  };
}

/** Where the set is shipped back, as the label reads. */
function ShipTo({ shipTo }: { shipTo: JobDetailJson["shipTo"] }) {
  if (!shipTo)
    return (
      <p className="text-sm" data-testid="ship-to">
        No return address on file: ask the owner before shipping.
      </p>
    );
  return (
    <div className="text-sm" data-testid="ship-to">
      <p className="font-semibold">
        {shipTo.chosen ? "Ship to (chosen by the owner)" : "Ship to (owner's default address; not confirmed for this job)"}
      </p>
      <address className="not-italic">
        {shipTo.lines.map((l, i) => (
          <span key={i} className="block">
            {l}
          </span>
        ))}
      </address>
    </div>
  );
}

function ReturnPanel({ jobId, shipTo }: { jobId: string; shipTo: JobDetailJson["shipTo"] }) {
  const onChange = useStateChange(jobId);
  const form = useForm<ReturnForm, unknown, ReturnInput>({
    resolver: zodResolver(returnFormSchema),
    defaultValues: { method: "pick-up", carrier: "", trackingNumber: "" },
  });
  const method = useWatch({ control: form.control, name: "method" });
  const [done, setDone] = useState<string | null>(null);
  const m = useMutation({
    mutationFn: (body: ReturnInput) => api<{ code: string }>(`/api/bench/jobs/${jobId}/return`, { method: "POST", body }),
    onSuccess: (res) => {
      setDone(res.code);
      onChange();
    },
    onError: (e) => {
      if (e instanceof ApiError)
        for (const k of ["carrier", "trackingNumber"] as const) if (e.fields[k]) form.setError(k, { message: e.fields[k] });
    },
  });
  const errs = form.formState.errors;
  return (
    <form noValidate className="card space-y-2 p-3" onSubmit={form.handleSubmit((v) => m.mutate(v))} aria-labelledby="return-heading">
      <h4 id="return-heading" className="font-semibold">
        Record the return
      </h4>
      <fieldset className="flex gap-4 text-sm">
        <legend className="sr-only">How the set goes back</legend>
        <label className="inline-flex items-center gap-1.5">
          <input type="radio" value="pick-up" {...form.register("method")} /> Picked up at the shop
        </label>
        <label className="inline-flex items-center gap-1.5">
          <input type="radio" value="shipped" {...form.register("method")} /> Shipped
        </label>
      </fieldset>
      {method === "shipped" ? <ShipTo shipTo={shipTo} /> : null}
      {method === "shipped" ? (
        <div className="flex flex-wrap gap-3">
          <div>
            <label htmlFor="ret-carrier" className="field-label">
              Carrier
            </label>
            <input
              id="ret-carrier"
              className="field-input py-1"
              aria-invalid={errs.carrier ? true : undefined}
              aria-describedby={errs.carrier ? "ret-carrier-error" : undefined}
              {...form.register("carrier")}
            />
            {errs.carrier?.message ? (
              <p id="ret-carrier-error" className="field-error">
                {errs.carrier.message}
              </p>
            ) : null}
          </div>
          <div>
            <label htmlFor="ret-tracking" className="field-label">
              Tracking number
            </label>
            <input
              id="ret-tracking"
              className="field-input figure py-1"
              aria-invalid={errs.trackingNumber ? true : undefined}
              aria-describedby={errs.trackingNumber ? "ret-tracking-error" : undefined}
              {...form.register("trackingNumber")}
            />
            {errs.trackingNumber?.message ? (
              <p id="ret-tracking-error" className="field-error">
                {errs.trackingNumber.message}
              </p>
            ) : null}
          </div>
        </div>
      ) : null}
      {m.isError ? (
        <Notice tone="error" live>
          {errorText(m.error)}
        </Notice>
      ) : null}
      {done ? (
        <Notice tone="success" live>
          Return recorded; warranty certificate <span className="figure">{done}</span> issued.
        </Notice>
      ) : null}
      <button type="submit" className="btn-primary" disabled={m.isPending}>
        Record the return and issue the certificate
      </button>
    </form>
  );
}

export function CompletionPanel({ detail }: { detail: JobDetailJson }) {
  const timeZone = useShopTimeZone();
  const jobId = detail.job.id;
  const state = detail.job.state;
  const onChange = useStateChange(jobId);
  const sheet = useQuery({ queryKey: benchKeys.sheet(jobId), queryFn: () => api<BenchSheetJson>(`/api/bench/jobs/${jobId}/sheet`) });
  const [refusal, setRefusal] = useState<{ message: string; reasons: string[] } | null>(null);
  const [result, setResult] = useState<string | null>(null);
  const act = useMutation({
    mutationFn: (path: "start-bench" | "final-checks" | "back-to-bench" | "complete") =>
      api<{
        balanceMinor?: number;
        owedBackMinor?: number;
        waivedMinor?: number;
        movedOn?: boolean;
        currency?: string;
        exponent?: number;
      }>(`/api/bench/jobs/${jobId}/${path}`, { method: "POST" }),
    onSuccess: (res) => {
      setRefusal(null);
      setResult(
        res.balanceMinor !== undefined && res.currency
          ? res.movedOn
            ? `Completed. Nothing is left to pay, so the job moved on to its return.${
                res.waivedMinor
                  ? ` The last ${moneyText(res.waivedMinor, res.currency, res.exponent ?? 2)} was waived, below the smallest card payment.`
                  : ""
              }${res.owedBackMinor ? ` ${moneyText(res.owedBackMinor, res.currency, res.exponent ?? 2)} is owed back to the owner.` : ""}`
            : `Completed. The owner has been asked to pay the balance of ${moneyText(res.balanceMinor, res.currency, res.exponent ?? 2)}.`
          : null,
      );
      onChange();
    },
    onError: (e) => {
      setResult(null);
      setRefusal({ message: errorText(e), reasons: e instanceof ApiError ? Object.values(e.fields) : [] });
      void sheetRefetch();
    },
  });
  const sheetRefetch = () => sheet.refetch();
  const reasons = sheet.data?.reasons ?? [];

  return (
    <div className="space-y-3">
      <section className="card p-3" aria-labelledby="gate-heading">
        <h3 id="gate-heading" className="text-lg font-semibold">
          Ready to complete?
        </h3>
        {sheet.isPending ? (
          <p role="status">Checking…</p>
        ) : reasons.length === 0 ? (
          <p className="text-pass">
            <span aria-hidden="true">✓ </span>Every required reading passes and every checklist line is ticked.
          </p>
        ) : (
          <>
            <p className="text-sm">
              <span aria-hidden="true">✕ </span>
              {reasons.length} {reasons.length === 1 ? "thing stands" : "things stand"} in the way:
            </p>
            <ul className="list-disc pl-5 text-sm" aria-label="What stands in the way">
              {reasons.map((r) => (
                <li key={`${r.kind}:${r.key}`} data-reason={r.kind}>
                  {r.text}
                </li>
              ))}
            </ul>
          </>
        )}
      </section>

      {refusal ? (
        <Notice tone="error" title="Not yet" live>
          <p>{refusal.message}</p>
          {refusal.reasons.length ? (
            <ul className="list-disc pl-5">
              {refusal.reasons.map((r) => (
                <li key={r}>{r}</li>
              ))}
            </ul>
          ) : null}
        </Notice>
      ) : null}
      {result ? (
        <Notice tone="success" live>
          {result}
        </Notice>
      ) : null}

      <div className="flex flex-wrap gap-2">
        {state === "deposit_paid" ? (
          <button type="button" className="btn-primary" onClick={() => act.mutate("start-bench")} disabled={act.isPending}>
            Set received — start work
          </button>
        ) : null}
        {state === "on_bench" ? (
          <button type="button" className="btn-primary" onClick={() => act.mutate("final-checks")} disabled={act.isPending}>
            Start final checks
          </button>
        ) : null}
        {state === "final_checks" ? (
          <>
            <button type="button" className="btn-primary" onClick={() => act.mutate("complete")} disabled={act.isPending}>
              Complete and ask for the balance
            </button>
            <button type="button" className="btn-secondary" onClick={() => act.mutate("back-to-bench")} disabled={act.isPending}>
              Back to the bench
            </button>
          </>
        ) : null}
      </div>
      {state === "bench_revision" ? (
        <Notice tone="info">A revision is waiting for the owner. The set stays on the bench; the approved work can go on.</Notice>
      ) : null}
      {state === "balance_due" ? <Notice tone="info">Waiting for the owner to pay the balance online.</Notice> : null}
      {state === "paid_in_full" ? <ReturnPanel jobId={jobId} shipTo={detail.shipTo} /> : null}
      {state === "returned" ? (
        <Notice tone="success">
          Returned{" "}
          {detail.job.returnMethod === "shipped"
            ? `by ${detail.job.carrier}, tracking ${detail.job.trackingNumber}`
            : "— picked up at the shop"}
          {detail.job.returnedAt ? ` on ${formatDate(detail.job.returnedAt, { timeZone, style: "compact" })}` : ""}.
          {detail.job.returnMethod === "shipped" ? <ShipTo shipTo={detail.shipTo} /> : null}
        </Notice>
      ) : null}
    </div>
  );
}
