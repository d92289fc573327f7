"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { describedBy, Field } from "@/components/ui/field";
import { declineSchema } from "@/lib/validation/quote";

const reasonSchema = declineSchema.pick({ reason: true, afterDecline: true });
type ReasonInput = z.infer<typeof reasonSchema>;

// Loaded only when the owner chooses to decline, so the job page does not carry the form code up front.
export default function DeclineForm({
  pending,
  onDecline,
  onBack,
  atBench = false,
}: {
  pending: boolean;
  onDecline: (reason: string, afterDecline?: ReasonInput["afterDecline"]) => void;
  onBack: () => void;
  /** The set is on the bench: the owner also chooses how the job goes on. */
  atBench?: boolean;
}) {
  const { register, handleSubmit, formState, setError } = useForm<ReasonInput>({ resolver: zodResolver(reasonSchema) });
  const submit = (v: ReasonInput) => {
    if (atBench && !v.afterDecline) {
      setError("afterDecline", { message: 'Choose "carry on with the work I approved before" or "return my set as it is".' });
      return;
    }
    onDecline(v.reason, atBench ? v.afterDecline : undefined);
  };
  return (
    <form noValidate className="space-y-3" onSubmit={handleSubmit(submit)}>
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
      {atBench ? (
        <fieldset
          className="space-y-2"
          aria-invalid={!!formState.errors.afterDecline}
          aria-describedby={formState.errors.afterDecline ? "afterDecline-error" : undefined}
        >
          <legend className="field-label">Your set is on our bench. How should we go on?</legend>
          <label className="flex items-start gap-2">
            <input type="radio" value="approved-scope" {...register("afterDecline")} />
            <span>Carry on with the work I approved before</span>
          </label>
          <label className="flex items-start gap-2">
            <input type="radio" value="return-as-is" {...register("afterDecline")} />
            <span>Stop the work and return my set as it is (what I have paid settles the job)</span>
          </label>
          {formState.errors.afterDecline ? (
            <p id="afterDecline-error" className="text-sm text-fail">
              {formState.errors.afterDecline.message}
            </p>
          ) : null}
        </fieldset>
      ) : null}
      <div className="flex flex-wrap gap-3">
        <button type="submit" className="btn-primary" disabled={pending}>
          {pending ? "Sending…" : atBench ? "Decline the change" : "Decline the estimate"}
        </button>
        <button type="button" className="btn-quiet" onClick={onBack}>
          Go back
        </button>
      </div>
    </form>
  );
}
