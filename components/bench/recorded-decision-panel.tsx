"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { api, ApiError, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { DECISION_MEDIA, DECISION_MEDIUM_LABEL, type DecisionMedium } from "@/lib/engine/contacts";
import { formatDateTime } from "@/lib/engine/dates";
import { recordDecisionSchema } from "@/lib/validation/intake";
import type { JobDetailJson } from "./types";

type Form = z.input<typeof recordDecisionSchema>;

/** Decisions staff recorded for the owner: who recorded which, when, how it was given and what was said. */
export function RecordedDecisions({ detail }: { detail: JobDetailJson }) {
  const timeZone = useShopTimeZone();
  const recorded = detail.decisions.filter((d) => d.recordedByName && d.decisionMedium);
  if (!recorded.length) return null;
  return (
    <section className="card space-y-1 p-3 text-sm" aria-label="Decisions recorded for the owner">
      <h2 className="font-semibold">Decisions recorded for the owner</h2>
      <ul className="space-y-1">
        {recorded.map((d) => (
          <li key={d.id} className="[overflow-wrap:anywhere]">
            {d.status === "declined" ? "✕ Declined" : "✓ Approved"} revision {d.revision}, given{" "}
            {DECISION_MEDIUM_LABEL[d.decisionMedium as DecisionMedium]}; recorded by {d.recordedByName}
            {d.decidedAt ? ` on ${formatDateTime(d.decidedAt, { timeZone, style: "compact", showZone: true })}` : ""}: “{d.decisionNote}”
          </li>
        ))}
      </ul>
    </section>
  );
}

/**
 * The owner's answer to the estimate waiting for one, taken in person, by phone or in writing. Shown to staff
 * who may record decisions; the server checks the revision is still the one waiting.
 */
export function RecordDecisionPanel({ detail }: { detail: JobDetailJson }) {
  const queryClient = useQueryClient();
  const [done, setDone] = useState<string | null>(null);
  const pending = [...detail.decisions].reverse().find((d) => d.status === "sent");
  const atBench = detail.job.state === "bench_revision";
  const { register, handleSubmit, formState, control, setError } = useForm<Form>({
    resolver: zodResolver(recordDecisionSchema),
    defaultValues: {
      revisionId: pending?.id ?? "",
      decision: "approve",
      medium: detail.job.channel === "phone" ? "phone" : "in-person",
      note: "",
    },
  });
  const decision = useWatch({ control, name: "decision" });
  const save = useMutation({
    mutationFn: (values: Form) => api<{ decision: string }>(`/api/bench/jobs/${detail.job.id}/decision`, { method: "POST", body: values }),
    onSuccess: async (r) => {
      setDone(r.decision === "approve" ? "Approval recorded." : "Decline recorded.");
      await queryClient.invalidateQueries({ queryKey: benchKeys.job(detail.job.id) });
      await queryClient.invalidateQueries({ queryKey: benchKeys.estimate(detail.job.id) });
    },
    onError: (e) => {
      if (e instanceof ApiError) for (const [f, m] of Object.entries(e.fields)) setError(f as keyof Form, { message: m });
    },
  });
  if (!pending || (detail.job.state !== "estimate_sent" && !atBench)) return done ? <p role="status">{done}</p> : null;
  const { errors } = formState;
  return (
    <section className="card space-y-3 p-4" aria-labelledby="record-decision-title">
      <h2 id="record-decision-title" className="text-lg font-semibold">
        Record the owner&apos;s answer to revision {pending.revision}
      </h2>
      <p className="text-sm text-bakelite-soft">
        {detail.customer.contactOnly
          ? "This customer does not sign in: record what they told you in person, by phone or in writing."
          : "The owner can also answer in the portal. Record an answer only when they gave it to you directly."}
      </p>
      {save.isError && !(save.error instanceof ApiError && Object.keys(save.error.fields).length) ? (
        <Notice tone="error" live>
          <p>{errorText(save.error)}</p>
        </Notice>
      ) : null}
      <form onSubmit={handleSubmit((v) => save.mutate(v))} noValidate className="space-y-3">
        <input type="hidden" {...register("revisionId")} />
        <div className="grid gap-3 sm:grid-cols-2">
          <fieldset>
            <legend className="field-label">Decision</legend>
            <label className="flex items-center gap-2">
              <input type="radio" value="approve" {...register("decision")} />
              Approved
            </label>
            <label className="flex items-center gap-2">
              <input type="radio" value="decline" {...register("decision")} />
              Declined
            </label>
          </fieldset>
          <fieldset aria-describedby={errors.medium ? "medium-error" : undefined}>
            <legend className="field-label">How it was given</legend>
            {DECISION_MEDIA.map((m) => (
              <label key={m} className="flex items-center gap-2">
                <input type="radio" value={m} {...register("medium")} />
                {DECISION_MEDIUM_LABEL[m]}
              </label>
            ))}
            {errors.medium ? (
              <p id="medium-error" className="field-error" role="alert">
                {errors.medium.message}
              </p>
            ) : null}
          </fieldset>
        </div>
        {atBench && decision === "decline" ? (
          <fieldset aria-describedby={errors.afterDecline ? "afterDecline-error" : undefined}>
            <legend className="field-label">What happens next</legend>
            <label className="flex items-center gap-2">
              <input type="radio" value="approved-scope" {...register("afterDecline")} />
              Carry on with the work approved before
            </label>
            <label className="flex items-center gap-2">
              <input type="radio" value="return-as-is" {...register("afterDecline")} />
              Return the set as it is
            </label>
            {errors.afterDecline ? (
              <p id="afterDecline-error" className="field-error" role="alert">
                {errors.afterDecline.message}
              </p>
            ) : null}
          </fieldset>
        ) : null}
        <Field
          id="decision-note"
          label="What the owner said"
          hint="Who you spoke to and what they agreed; kept on the job and in the audit log."
          error={errors.note?.message}
        >
          <textarea
            id="decision-note"
            rows={2}
            className="field-input"
            aria-invalid={!!errors.note}
            aria-describedby={describedBy("decision-note", { error: errors.note, hint: true })}
            {...register("note")}
          />
        </Field>
        <button type="submit" className="btn-primary" disabled={save.isPending}>
          {save.isPending ? "Recording…" : decision === "decline" ? "Record the decline" : "Record the approval"}
        </button>
      </form>
    </section>
  );
}
