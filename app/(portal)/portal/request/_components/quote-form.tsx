"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useCallback, useState } from "react";
import { useForm, useWatch, type Path } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { CAUTIONS, quoteRequestSchema, type QuoteRequest, type QuoteRequestInput } from "@/lib/validation/quote";
import { api, ApiError } from "../../_lib/api";
import { portalKeys } from "../../_lib/query-keys";
import { PhotoPicker, type PhotoPickerState } from "@/components/photo-picker";
import { SetProfileFields } from "@/components/set-profile-fields";

export function QuoteForm() {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const [uploading, setUploading] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const { register, handleSubmit, setValue, setError, formState, control } = useForm<QuoteRequestInput, unknown, QuoteRequest>({
    resolver: zodResolver(quoteRequestSchema),
    defaultValues: { bands: [], photos: [], idempotencyKey, delivery: "mail-in", contactPreference: "email", poweredRecently: undefined },
  });
  const { errors, isSubmitting } = formState;
  const contact = useWatch({ control, name: "contactPreference" });

  const onPhotos = useCallback(
    (s: PhotoPickerState) => {
      setUploading(s.busy);
      setValue("photos", s.tickets, { shouldValidate: formState.isSubmitted });
    },
    [setValue, formState.isSubmitted],
  );

  const submit = useMutation({
    mutationFn: (values: QuoteRequest) => api<{ jobId: string; number: string }>("/api/portal/jobs", { method: "POST", body: values }),
    onSuccess: async ({ jobId }) => {
      await queryClient.invalidateQueries({ queryKey: portalKeys.jobs() });
      router.push(`/portal/jobs/${jobId}?new=1`);
    },
    onError: (e) => {
      if (e instanceof ApiError && Object.keys(e.fields).length) {
        for (const [field, message] of Object.entries(e.fields))
          setError((field.startsWith("dialEnds.") ? field : field.split(".")[0]) as Path<QuoteRequestInput>, { message });
        setProblem("Some answers need another look; see the notes beside them.");
      } else setProblem(e instanceof Error ? e.message : "We could not send your request. Please try again.");
    },
  });

  const onSubmit = handleSubmit(
    (values) => {
      setProblem(null);
      if (uploading) {
        setProblem("Please wait until every photo has finished uploading.");
        return;
      }
      submit.mutate(values);
    },
    () => setProblem("Some answers need another look; see the notes beside them."),
  );

  const input = (id: Path<QuoteRequestInput>, hint?: boolean) => ({
    id,
    className: "field-input",
    "aria-invalid": !!errors[id as keyof typeof errors],
    "aria-describedby": describedBy(id, { error: errors[id as keyof typeof errors], hint }),
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-10">
      {problem ? (
        <Notice tone="error" live>
          <p>{problem}</p>
        </Notice>
      ) : null}

      <SetProfileFields register={register} errors={errors} control={control} />

      <fieldset className="space-y-4">
        <legend className="font-serif text-xl font-bold">Photos</legend>
        <p id="photos-hint" className="text-bakelite-soft">
          Photos let the technician see the set before it travels. We remove location and camera details from every photo.
        </p>
        <PhotoPicker
          onChange={onPhotos}
          error={errors.photos?.message}
          describedById={describedBy("photos", { error: errors.photos, hint: true })}
        />
        {errors.photos ? (
          <p id="photos-error" className="field-error" role="alert">
            {errors.photos.message}
          </p>
        ) : null}
      </fieldset>

      <fieldset className="space-y-5">
        <legend className="font-serif text-xl font-bold">Getting the set to us, and reaching you</legend>
        <div className="grid gap-5 sm:grid-cols-2">
          <fieldset>
            <legend className="field-label">How will the set reach the shop?</legend>
            <div className="mt-2 space-y-1">
              <label className="flex items-center gap-2">
                <input type="radio" value="mail-in" {...register("delivery")} />I will send it by mail or courier
              </label>
              <label className="flex items-center gap-2">
                <input type="radio" value="drop-off" {...register("delivery")} />I will bring it to the shop in Port Alder
              </label>
            </div>
          </fieldset>
          <fieldset>
            <legend className="field-label">How should we reach you?</legend>
            <div className="mt-2 space-y-1">
              <label className="flex items-center gap-2">
                <input type="radio" value="email" {...register("contactPreference")} />
                By e-mail
              </label>
              <label className="flex items-center gap-2">
                <input type="radio" value="phone" {...register("contactPreference")} />
                By phone
              </label>
            </div>
          </fieldset>
        </div>
        {contact === "phone" ? (
          <Field id="phone" label="Phone number" error={errors.phone?.message}>
            <input {...input("phone")} {...register("phone")} type="tel" autoComplete="tel" />
          </Field>
        ) : null}
      </fieldset>

      <section aria-labelledby="cautions-title" className="space-y-3">
        <Notice tone="caution" title="Before you send anything: please read">
          <ul id="cautions-title" className="list-disc space-y-1 pl-5">
            {CAUTIONS.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </Notice>
        <label className="flex items-start gap-3">
          <input
            type="checkbox"
            className="mt-1"
            {...register("cautionsAcknowledged")}
            aria-invalid={!!errors.cautionsAcknowledged}
            aria-describedby={errors.cautionsAcknowledged ? "cautionsAcknowledged-error" : undefined}
          />
          <span>I have read these cautions. I will not power the set until it has been restored.</span>
        </label>
        {errors.cautionsAcknowledged ? (
          <p id="cautionsAcknowledged-error" className="field-error" role="alert">
            {errors.cautionsAcknowledged.message}
          </p>
        ) : null}
      </section>

      <div className="flex flex-wrap items-center gap-4">
        <button type="submit" className="btn-primary px-6 py-3 text-base" disabled={isSubmitting || submit.isPending}>
          {submit.isPending ? "Sending your request…" : "Send my quote request"}
        </button>
        {uploading ? <p className="text-sm text-bakelite-muted">Photos are still uploading…</p> : null}
        <p className="text-sm text-bakelite-muted">Nothing is charged for a quote.</p>
      </div>
    </form>
  );
}
