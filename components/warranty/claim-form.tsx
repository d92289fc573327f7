"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useCallback, useState } from "react";
import { PhotoPicker, type PhotoPickerState } from "@/components/photo-picker";
import { useForm, type Path } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { claimFormSchema, OWNER_STATEMENT_LABEL, ownerStatementCodes, SYMPTOM_OPTIONS, type ClaimFormInput } from "@/lib/validation/claims";
import { ApiFailure, postJson, warrantyKeys } from "@/lib/client/warranty-query-keys";

type Values = ClaimFormInput;

/** Opens a claim: from one of the owner's certificates, or with a certificate code (a later owner). */
export function ClaimForm({ certificateId, setName }: { certificateId?: string; setName?: string }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const byCode = !certificateId;
  const [uploads, setUploads] = useState<PhotoPickerState>({ tickets: [], busy: false });
  const { register, handleSubmit, formState, setError, setValue } = useForm<Values>({
    resolver: zodResolver(claimFormSchema),
    defaultValues: { code: "", description: "", statements: [], photos: [] },
  });
  const onPhotos = useCallback(
    (state: PhotoPickerState) => {
      setUploads(state);
      setValue("photos", state.tickets);
    },
    [setValue],
  );
  const { errors } = formState;
  const open = useMutation({
    mutationFn: (values: Values) =>
      byCode
        ? postJson<{ claim: { id: string } }>("/api/claims/by-code", values)
        : postJson<{ claim: { id: string } }>("/api/claims", {
            symptomCategory: values.symptomCategory,
            description: values.description,
            statements: values.statements,
            photos: values.photos,
            certificateId,
          }),
    onSuccess: async ({ claim }) => {
      await queryClient.invalidateQueries({ queryKey: warrantyKeys.myClaims() });
      router.push(`/portal/claims/${claim.id}`);
    },
    onError: (e) => {
      if (e instanceof ApiFailure && e.error.fields) {
        for (const [field, message] of Object.entries(e.error.fields)) setError(field as Path<Values>, { message });
      }
    },
  });
  const onSubmit = handleSubmit((values) => open.mutate(values));

  return (
    <form onSubmit={onSubmit} className="card space-y-4 p-5" noValidate>
      <Notice tone="caution" title="Unplug the set first">
        <p>
          Until the shop has looked at the fault, keep the set unplugged and take out any batteries. A shock, a tingle, smoke or a hot smell
          means: do not switch it on again.
        </p>
      </Notice>
      {byCode ? (
        <Field id="code" label="Certificate code" error={errors.code?.message} hint="As printed under the QR code, e.g. 7K2M-QX4R-…">
          <input
            id="code"
            className="field-input figure"
            autoComplete="off"
            aria-invalid={!!errors.code}
            aria-describedby={describedBy("code", { error: errors.code, hint: true })}
            {...register("code")}
          />
        </Field>
      ) : (
        <p>
          Claim on the certificate for <strong>{setName}</strong>.
        </p>
      )}
      <Field id="symptomCategory" label="What does the set do?" error={errors.symptomCategory?.message}>
        <select
          id="symptomCategory"
          className="field-input"
          aria-invalid={!!errors.symptomCategory}
          aria-describedby={describedBy("symptomCategory", { error: errors.symptomCategory })}
          defaultValue=""
          {...register("symptomCategory")}
        >
          <option value="" disabled>
            Choose one
          </option>
          {SYMPTOM_OPTIONS.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      </Field>
      <Field
        id="description"
        label="Describe the fault"
        error={errors.description?.message}
        hint="When it started, what you hear or see, what you tried."
      >
        <textarea
          id="description"
          rows={5}
          className="field-input"
          aria-invalid={!!errors.description}
          aria-describedby={describedBy("description", { error: errors.description, hint: true })}
          {...register("description")}
        />
      </Field>
      <fieldset className="space-y-1">
        <legend className="field-label">Since the set came back, did any of these happen?</legend>
        <p className="field-hint">Tick what applies; it helps the shop judge the claim quickly.</p>
        {ownerStatementCodes.map((code) => (
          <label key={code} className="flex items-start gap-2">
            <input type="checkbox" value={code} className="mt-1" {...register("statements")} />
            <span>{OWNER_STATEMENT_LABEL[code]}</span>
          </label>
        ))}
      </fieldset>
      <div className="space-y-1">
        <p className="field-label" id="claim-photos-label">
          Photos (optional)
        </p>
        <p className="field-hint" id="claim-photos-hint">
          The back of the set, the chassis, anything burnt or broken.
        </p>
        <PhotoPicker onChange={onPhotos} error={errors.photos?.message} describedById="claim-photos-hint" />
      </div>
      {open.error ? (
        <Notice tone="error" title="The claim was not opened" live>
          <p>{open.error.message}</p>
        </Notice>
      ) : null}
      <button type="submit" className="btn-primary" disabled={open.isPending || uploads.busy}>
        {open.isPending ? "Sending…" : uploads.busy ? "Waiting for the photos…" : "Open the claim"}
      </button>
    </form>
  );
}
