"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { describedBy, Field } from "@/components/ui/field";
import { revokeCertificateSchema } from "@/lib/validation/claims";
import { ApiFailure, postJson } from "@/lib/client/warranty-query-keys";

type Reason = z.input<typeof revokeCertificateSchema>;

function ReasonForm({
  id,
  action,
  label,
  hint,
  onDone,
}: {
  id: string;
  action: "revoke" | "reissue";
  label: string;
  hint: string;
  onDone: () => void;
}) {
  const { register, handleSubmit, formState, setError } = useForm<Reason>({
    resolver: zodResolver(revokeCertificateSchema),
    defaultValues: { reason: "" },
  });
  const fieldId = `${action}-${id}`;
  // Revoking cannot be undone: the reason is asked for, then what will happen is named and confirmed.
  const [confirming, setConfirming] = useState<Reason | null>(null);
  const mutation = useMutation({
    mutationFn: (v: Reason) => postJson(`/api/certificates/${id}/${action}`, v),
    onSuccess: onDone,
    onError: (e) =>
      setError("reason", { message: e instanceof ApiFailure ? (e.error.fields?.reason ?? e.error.message) : "That did not work." }),
  });
  const error = formState.errors.reason?.message;
  return (
    <form
      onSubmit={handleSubmit((v) => (action === "revoke" ? setConfirming(v) : mutation.mutate(v)))}
      className="mt-2 space-y-2"
      noValidate
    >
      <Field id={fieldId} label={label} error={error} hint={hint}>
        <input
          id={fieldId}
          className="field-input"
          aria-invalid={!!error}
          aria-describedby={describedBy(fieldId, { error, hint })}
          {...register("reason")}
        />
      </Field>
      <button type="submit" className={action === "revoke" ? "btn-secondary" : "btn-primary"} disabled={mutation.isPending}>
        {action === "revoke" ? "Revoke the certificate" : "Issue the corrected certificate"}
      </button>
      {confirming ? (
        <div role="alertdialog" aria-labelledby={`${fieldId}-confirm`} className="space-y-2 rounded-card border border-fail p-3">
          <p id={`${fieldId}-confirm`} className="text-sm">
            Revoke this certificate? It cannot be undone: the public verification page will show it as revoked with your reason, and we
            e-mail the owner of the set.
          </p>
          <div className="flex flex-wrap gap-2">
            <button
              type="button"
              className="btn-primary"
              disabled={mutation.isPending}
              onClick={() => {
                mutation.mutate(confirming);
                setConfirming(null);
              }}
            >
              Yes, revoke the certificate
            </button>
            <button type="button" className="btn-quiet" onClick={() => setConfirming(null)}>
              Cancel
            </button>
          </div>
        </div>
      ) : null}
    </form>
  );
}

export function CertificateActions({ id, canRevoke, canReissue }: { id: string; canRevoke: boolean; canReissue: boolean }) {
  const router = useRouter();
  const [open, setOpen] = useState<"revoke" | "reissue" | null>(null);
  const done = () => {
    setOpen(null);
    router.refresh();
  };
  if (!canRevoke && !canReissue) return null;
  return (
    <div>
      <div className="flex flex-wrap gap-2">
        {canReissue ? (
          <button
            type="button"
            className="btn-quiet"
            aria-expanded={open === "reissue"}
            onClick={() => setOpen(open === "reissue" ? null : "reissue")}
          >
            Correct…
          </button>
        ) : null}
        {canRevoke ? (
          <button
            type="button"
            className="btn-quiet"
            aria-expanded={open === "revoke"}
            onClick={() => setOpen(open === "revoke" ? null : "revoke")}
          >
            Revoke…
          </button>
        ) : null}
      </div>
      {open === "revoke" ? (
        <ReasonForm id={id} action="revoke" label="Reason for revoking" hint="Shown on the public verification page." onDone={done} />
      ) : null}
      {open === "reissue" ? (
        <ReasonForm
          id={id}
          action="reissue"
          label="What is corrected"
          hint="A new certificate is built from the job's stored readings; this one will say it was superseded."
          onDone={done}
        />
      ) : null}
    </div>
  );
}
