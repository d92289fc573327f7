"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useCallback, useState } from "react";
import { useForm, useWatch, type Path } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import {
  BAND_LABEL,
  CAUTIONS,
  DIAL_BANDS,
  POWERED_LABEL,
  POWERED_RECENTLY,
  quoteRequestSchema,
  SET_KIND_HELP,
  SET_KINDS,
  type QuoteRequest,
  type QuoteRequestInput,
} from "@/lib/validation/quote";
import { api, ApiError } from "../../_lib/api";
import { portalKeys } from "../../_lib/query-keys";
import { PhotoPicker, type PhotoPickerState } from "@/components/photo-picker";

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
  const tickedBands = (useWatch({ control, name: "bands" }) ?? []) as (typeof DIAL_BANDS)[number][];

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

      <fieldset className="space-y-5">
        <legend className="font-serif text-xl font-bold">Your set</legend>
        <p className="text-bakelite-soft">Copy the names as they are printed on the cabinet, the dial or the label on the back.</p>
        <div className="grid gap-5 sm:grid-cols-2">
          <Field id="maker" label="Maker" error={errors.maker?.message}>
            <input {...input("maker")} {...register("maker")} autoComplete="off" />
          </Field>
          <Field id="model" label="Model" error={errors.model?.message}>
            <input {...input("model")} {...register("model")} autoComplete="off" />
          </Field>
          <Field id="year" label="Year (if you know it)" error={errors.year?.message}>
            <input {...input("year")} {...register("year")} inputMode="numeric" />
          </Field>
          <Field id="serial" label="Serial number (if you can see one)" error={errors.serial?.message}>
            <input {...input("serial")} {...register("serial")} autoComplete="off" />
          </Field>
        </div>
        <fieldset aria-describedby={errors.kind ? "kind-error" : undefined}>
          <legend className="field-label">What kind of set is it?</legend>
          <div className="mt-2 grid gap-2 sm:grid-cols-2">
            {SET_KINDS.map((k) => (
              <label key={k} className="card flex cursor-pointer gap-3 p-3 has-[:checked]:border-ember">
                <input type="radio" value={k} {...register("kind")} className="mt-1" />
                <span>
                  <span className="block font-semibold">{SET_KIND_HELP[k].label}</span>
                  <span className="block text-sm text-bakelite-muted">{SET_KIND_HELP[k].hint}</span>
                </span>
              </label>
            ))}
          </div>
          {errors.kind ? (
            <p id="kind-error" className="field-error" role="alert">
              {errors.kind.message}
            </p>
          ) : null}
        </fieldset>
        <fieldset aria-describedby={errors.bands ? "bands-error" : undefined}>
          <legend className="field-label">Bands printed on the dial</legend>
          <div className="mt-2 flex flex-wrap gap-x-6 gap-y-2">
            {DIAL_BANDS.map((b) => (
              <label key={b} className="flex items-center gap-2">
                <input type="checkbox" value={b} {...register("bands")} />
                {BAND_LABEL[b]}
              </label>
            ))}
          </div>
          {errors.bands ? (
            <p id="bands-error" className="field-error" role="alert">
              {errors.bands.message}
            </p>
          ) : null}
        </fieldset>
        {tickedBands.length ? (
          <fieldset className="space-y-2">
            <legend className="field-label">Numbers at the ends of each dial scale (optional)</legend>
            <p id="dialEnds-hint" className="field-hint">
              The lowest and the highest number printed on each band&apos;s scale, as you read them: for example 55 and 160 on MW, or 6 and
              18 on SW. They help us plan the alignment.
            </p>
            <div className="space-y-2">
              {DIAL_BANDS.filter((b) => tickedBands.includes(b)).map((b) => {
                const bandErrors = (
                  errors.dialEnds as Record<string, { low?: { message?: string }; high?: { message?: string } }> | undefined
                )?.[b];
                const end = (which: "low" | "high") => {
                  const id = `dialEnds-${b}-${which}`;
                  const message = bandErrors?.[which]?.message;
                  return (
                    <Field id={id} label={`${b}: ${which === "low" ? "lowest" : "highest"} number`} error={message}>
                      <input
                        id={id}
                        className="field-input figure"
                        inputMode="decimal"
                        aria-invalid={!!message}
                        aria-describedby={describedBy(id, { error: message })}
                        {...register(`dialEnds.${b}.${which}` as Path<QuoteRequestInput>)}
                      />
                    </Field>
                  );
                };
                return (
                  <div key={b} className="grid grid-cols-2 gap-3 sm:max-w-md">
                    {end("low")}
                    {end("high")}
                  </div>
                );
              })}
            </div>
          </fieldset>
        ) : null}
        <Field
          id="dialMarkings"
          label="Anything else printed on the dial scales (optional)"
          hint='Units or extra scales, for example "Mc", "kc/s" or "metres".'
          error={errors.dialMarkings?.message}
        >
          <input {...input("dialMarkings", true)} {...register("dialMarkings")} />
        </Field>
      </fieldset>

      <fieldset className="space-y-5">
        <legend className="font-serif text-xl font-bold">What is wrong with it</legend>
        <Field
          id="symptoms"
          label="What does it do, or not do?"
          hint="In your own words: hum, no sound, crackles, dial stuck, smell of burning…"
          error={errors.symptoms?.message}
        >
          <textarea {...input("symptoms", true)} {...register("symptoms")} rows={5} />
        </Field>
        <Field
          id="priorWork"
          label="Has anyone worked on it before? (optional)"
          hint="Parts replaced, repairs, or nothing you know of."
          error={errors.priorWork?.message}
        >
          <textarea {...input("priorWork", true)} {...register("priorWork")} rows={3} />
        </Field>
        <fieldset aria-describedby={errors.poweredRecently ? "poweredRecently-error" : undefined}>
          <legend className="field-label">Has it been plugged in or switched on recently?</legend>
          <div className="mt-2 space-y-1">
            {POWERED_RECENTLY.map((p) => (
              <label key={p} className="flex items-center gap-2">
                <input type="radio" value={p} {...register("poweredRecently")} />
                {POWERED_LABEL[p]}
              </label>
            ))}
          </div>
          {errors.poweredRecently ? (
            <p id="poweredRecently-error" className="field-error" role="alert">
              {errors.poweredRecently.message}
            </p>
          ) : null}
        </fieldset>
      </fieldset>

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
