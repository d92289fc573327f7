"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation } from "@tanstack/react-query";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useForm, type Path } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { decideClaimSchema, type DecideClaimInput } from "@/lib/validation/claims";
import { exclusionCodes, exclusionWording } from "@/lib/engine/warranty";
import { ApiFailure, postJson } from "@/lib/client/warranty-query-keys";

const DECISIONS = [
  { value: "accept", label: "Accept: open a warranty job, covered lines at no charge" },
  { value: "inspect", label: "Inspect first: ask the owner to send the set" },
  { value: "reject", label: "Reject, with a reason for the owner" },
] as const;

export function DecisionForm({ claimId, canInspect }: { claimId: string; canInspect: boolean }) {
  const router = useRouter();
  const { register, handleSubmit, formState, setError } = useForm<DecideClaimInput>({
    resolver: zodResolver(decideClaimSchema),
    defaultValues: { reason: "", findings: [] },
  });
  const { errors } = formState;
  const decide = useMutation({
    mutationFn: (values: DecideClaimInput) => postJson<{ warrantyJobId: string | null }>(`/api/claims/${claimId}/decision`, values),
    onSuccess: () => router.refresh(),
    onError: (e) => {
      if (e instanceof ApiFailure && e.error.fields)
        for (const [f, message] of Object.entries(e.error.fields)) setError(f as Path<DecideClaimInput>, { message });
    },
  });
  return (
    <form onSubmit={handleSubmit((v) => decide.mutate(v))} className="space-y-3" noValidate>
      <fieldset className="space-y-1" aria-describedby={errors.decision ? "decision-error" : undefined}>
        <legend className="field-label">Decision</legend>
        {DECISIONS.filter((d) => canInspect || d.value !== "inspect").map((d) => (
          <label key={d.value} className="flex items-start gap-2">
            <input type="radio" value={d.value} className="mt-1" {...register("decision")} />
            <span>{d.label}</span>
          </label>
        ))}
        {errors.decision ? (
          <p id="decision-error" className="field-error" role="alert">
            {errors.decision.message}
          </p>
        ) : null}
      </fieldset>
      <fieldset className="space-y-1">
        <legend className="field-label">Exclusions confirmed (photos or bench)</legend>
        {exclusionCodes.map((code) => (
          <label key={code} className="flex items-start gap-2 text-sm">
            <input type="checkbox" value={code} className="mt-1" {...register("findings")} />
            <span>{exclusionWording[code]}</span>
          </label>
        ))}
      </fieldset>
      <Field
        id="reason"
        label="Message to the owner"
        error={errors.reason?.message}
        hint="Required for a rejection; sent in the decision e-mail."
      >
        <textarea
          id="reason"
          rows={3}
          className="field-input"
          aria-invalid={!!errors.reason}
          aria-describedby={describedBy("reason", { error: errors.reason, hint: true })}
          {...register("reason")}
        />
      </Field>
      {decide.error ? (
        <Notice tone="error" title="Not saved" live>
          <p>{decide.error.message}</p>
        </Notice>
      ) : null}
      {decide.data?.warrantyJobId ? (
        <Notice tone="success" title="Warranty job opened" live>
          <Link href={`/bench/jobs/${decide.data.warrantyJobId}`}>Open the warranty job</Link>
        </Notice>
      ) : null}
      <button type="submit" className="btn-primary" disabled={decide.isPending}>
        {decide.isPending ? "Saving…" : "Record the decision"}
      </button>
    </form>
  );
}
