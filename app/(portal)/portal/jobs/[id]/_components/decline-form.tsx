"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { describedBy, Field } from "@/components/ui/field";
import { declineSchema } from "@/lib/validation/quote";

const reasonSchema = declineSchema.pick({ reason: true });
type ReasonInput = z.infer<typeof reasonSchema>;

// Loaded only when the owner chooses to decline, so the job page does not carry the form code up front.
export default function DeclineForm({
  pending,
  onDecline,
  onBack,
}: {
  pending: boolean;
  onDecline: (reason: string) => void;
  onBack: () => void;
}) {
  const { register, handleSubmit, formState } = useForm<ReasonInput>({ resolver: zodResolver(reasonSchema) });
  return (
    <form noValidate className="space-y-3" onSubmit={handleSubmit((v) => onDecline(v.reason))}>
      <Field
        id="reason"
        label="Why are you declining?"
        hint="The shop reads every answer; a reason helps them suggest another way."
        error={formState.errors.reason?.message}
      >
        <textarea
          id="reason"
          rows={3}
          className="field-input"
          autoFocus
          aria-invalid={!!formState.errors.reason}
          aria-describedby={describedBy("reason", { error: formState.errors.reason, hint: true })}
          {...register("reason")}
        />
      </Field>
      <div className="flex flex-wrap gap-3">
        <button type="submit" className="btn-primary" disabled={pending}>
          {pending ? "Sending…" : "Decline the estimate"}
        </button>
        <button type="button" className="btn-quiet" onClick={onBack}>
          Go back
        </button>
      </div>
    </form>
  );
}
