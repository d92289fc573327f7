"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useState } from "react";
import { useForm, useWatch, type Path } from "react-hook-form";
import { PhotoPicker, type PhotoPickerState } from "@/components/photo-picker";
import { SetProfileFields, type SetProfileWording } from "@/components/set-profile-fields";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { api, ApiError, errorText, retryLostAnswer } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { CUSTOMER_ACCESS_LABEL, type CustomerAccess } from "@/lib/engine/contacts";
import { intakeSchema, type Intake, type IntakeInput } from "@/lib/validation/intake";
import { CAUTIONS } from "@/lib/validation/quote";

type Match = { id: string; name: string; email: string | null; phone: string | null; access: CustomerAccess; jobs: number };

const STAFF_WORDING: SetProfileWording = {
  setLegend: "The set",
  setIntro: "Copy the names as printed on the cabinet, the dial or the label on the back; ask the customer for what you cannot see.",
  problemLegend: "What the customer says is wrong",
  symptomsLabel: "What does it do, or not do?",
  poweredLabel: "Has it been plugged in or switched on recently?",
};

/** Counter and phone intake: find or add the customer, then the set exactly as the online request asks. */
export function IntakeForm() {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const [uploading, setUploading] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [search, setSearch] = useState("");
  const [query, setQuery] = useState("");
  const [chosen, setChosen] = useState<Match | null>(null);
  const { register, handleSubmit, setValue, setError, formState, control } = useForm<IntakeInput, unknown, Intake>({
    resolver: zodResolver(intakeSchema),
    defaultValues: {
      customerMode: "existing",
      customerId: "",
      access: "invite",
      channel: "counter",
      setAtShop: true,
      contactPreference: "email",
      bands: [],
      photos: [],
      idempotencyKey,
    },
  });
  const { errors, isSubmitting } = formState;
  const mode = useWatch({ control, name: "customerMode" });
  const channel = useWatch({ control, name: "channel" });

  useEffect(() => {
    const t = setTimeout(() => setQuery(search.trim()), 250);
    return () => clearTimeout(t);
  }, [search]);
  useEffect(() => {
    if (channel === "phone") setValue("setAtShop", false);
  }, [channel, setValue]);

  const matches = useQuery({
    queryKey: benchKeys.customers(query),
    queryFn: () => api<{ customers: Match[] }>(`/api/bench/customers?q=${encodeURIComponent(query)}`),
    enabled: mode === "existing" && query.length >= 2,
  });

  const choose = (m: Match) => {
    setChosen(m);
    setValue("customerId", m.id, { shouldValidate: formState.isSubmitted });
    setValue("contactPreference", m.email ? "email" : "phone");
  };

  const onPhotos = useCallback(
    (s: PhotoPickerState) => {
      setUploading(s.busy);
      setValue("photos", s.tickets, { shouldValidate: formState.isSubmitted });
    },
    [setValue, formState.isSubmitted],
  );

  const submit = useMutation({
    mutationFn: (values: Intake) =>
      api<{ jobId: string; number: string; invited: boolean }>("/api/bench/intake", { method: "POST", body: values }),
    retry: retryLostAnswer,
    onSuccess: async ({ jobId }) => {
      await queryClient.invalidateQueries({ queryKey: benchKeys.queues() });
      router.push(`/bench/jobs/${jobId}?taken-in=1`);
    },
    onError: (e) => {
      if (e instanceof ApiError && Object.keys(e.fields).length) {
        for (const [field, message] of Object.entries(e.fields))
          setError((field.startsWith("dialEnds.") ? field : field.split(".")[0]) as Path<IntakeInput>, { message });
        setProblem("Some answers need another look; see the notes beside them.");
      } else setProblem(errorText(e));
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

  const input = (id: Path<IntakeInput>, hint?: boolean) => ({
    id,
    className: "field-input",
    "aria-invalid": !!errors[id as keyof typeof errors],
    "aria-describedby": describedBy(id, { error: errors[id as keyof typeof errors], hint }),
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-8">
      {problem ? (
        <Notice tone="error" live>
          <p>{problem}</p>
        </Notice>
      ) : null}

      <fieldset className="space-y-4">
        <legend className="font-serif text-xl font-bold">How the set came in</legend>
        <div className="flex flex-wrap gap-x-6 gap-y-2">
          <label className="flex items-center gap-2">
            <input type="radio" value="counter" {...register("channel")} />
            At the counter
          </label>
          <label className="flex items-center gap-2">
            <input type="radio" value="phone" {...register("channel")} />
            By phone
          </label>
        </div>
        {channel === "counter" ? (
          <label className="flex items-start gap-3">
            <input type="checkbox" className="mt-1" {...register("setAtShop")} aria-describedby="setAtShop-hint" />
            <span>
              The customer has handed the set over: it stays at the shop.
              <span id="setAtShop-hint" className="block text-sm text-bakelite-muted">
                Leave unticked if they will bring it back later; the job then waits for the set as usual.
              </span>
            </span>
          </label>
        ) : null}
        {errors.setAtShop ? (
          <p id="setAtShop-error" className="field-error" role="alert">
            {errors.setAtShop.message}
          </p>
        ) : null}
      </fieldset>

      <fieldset className="space-y-4">
        <legend className="font-serif text-xl font-bold">Customer</legend>
        <div className="flex flex-wrap gap-x-6 gap-y-2">
          <label className="flex items-center gap-2">
            <input type="radio" value="existing" {...register("customerMode")} />
            Someone we know
          </label>
          <label className="flex items-center gap-2">
            <input type="radio" value="new" {...register("customerMode")} />A new customer
          </label>
        </div>
        {mode === "existing" ? (
          <div className="space-y-3">
            <Field id="customer-search" label="Find by name, e-mail or phone" hint="At least two characters.">
              <input
                id="customer-search"
                type="search"
                className="field-input"
                value={search}
                autoComplete="off"
                aria-describedby="customer-search-hint"
                onChange={(e) => setSearch(e.target.value)}
              />
            </Field>
            {matches.isError ? <p className="field-error">{errorText(matches.error)}</p> : null}
            {matches.data ? (
              matches.data.customers.length ? (
                <ul className="space-y-2" aria-label="Customers found">
                  {matches.data.customers.map((m) => (
                    <li key={m.id}>
                      <label className="card flex cursor-pointer gap-3 p-3 has-[:checked]:border-ember">
                        <input
                          type="radio"
                          name="customer-choice"
                          checked={chosen?.id === m.id}
                          onChange={() => choose(m)}
                          className="mt-1"
                        />
                        <span className="min-w-0 [overflow-wrap:anywhere]">
                          <span className="block font-semibold">{m.name}</span>
                          <span className="block text-sm text-bakelite-muted">
                            {[m.email ?? "no e-mail", m.phone ?? "no phone"].join(" · ")}
                          </span>
                          <span className="block text-sm text-bakelite-muted">
                            {CUSTOMER_ACCESS_LABEL[m.access]} · {m.jobs === 1 ? "1 job" : `${m.jobs} jobs`}
                          </span>
                        </span>
                      </label>
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="text-bakelite-soft">Nobody matches. Check the spelling, or add a new customer.</p>
              )
            ) : null}
            {errors.customerId ? (
              <p id="customerId-error" className="field-error" role="alert">
                {errors.customerId.message}
              </p>
            ) : null}
          </div>
        ) : (
          <div className="space-y-4">
            <div className="grid gap-4 sm:grid-cols-3">
              <Field id="customerName" label="Customer's name" error={errors.customerName?.message}>
                <input {...input("customerName")} {...register("customerName")} autoComplete="off" />
              </Field>
              <Field id="customerEmail" label="Customer's e-mail" error={errors.customerEmail?.message}>
                <input {...input("customerEmail")} {...register("customerEmail")} type="email" autoComplete="off" />
              </Field>
              <Field id="customerPhone" label="Customer's phone" error={errors.customerPhone?.message}>
                <input {...input("customerPhone")} {...register("customerPhone")} type="tel" autoComplete="off" />
              </Field>
            </div>
            <fieldset aria-describedby={errors.access ? "access-error" : undefined}>
              <legend className="field-label">Sign-in</legend>
              <div className="mt-2 space-y-2">
                <label className="flex items-start gap-2">
                  <input type="radio" value="invite" {...register("access")} className="mt-1" />
                  <span>
                    Invite them to set a password
                    <span className="block text-sm text-bakelite-muted">
                      An e-mail with a single-use link; they then follow the job, approve and pay in the portal.
                    </span>
                  </span>
                </label>
                <label className="flex items-start gap-2">
                  <input type="radio" value="contact" {...register("access")} className="mt-1" />
                  <span>
                    Keep them as a contact, without sign-in
                    <span className="block text-sm text-bakelite-muted">
                      E-mails still reach them if they gave an address; you record their answers on the job.
                    </span>
                  </span>
                </label>
              </div>
              {errors.access ? (
                <p id="access-error" className="field-error" role="alert">
                  {errors.access.message}
                </p>
              ) : null}
            </fieldset>
          </div>
        )}
        <fieldset aria-describedby={errors.contactPreference ? "contactPreference-error" : undefined}>
          <legend className="field-label">How they want to be reached</legend>
          <div className="mt-2 flex flex-wrap gap-x-6 gap-y-2">
            <label className="flex items-center gap-2">
              <input type="radio" value="email" {...register("contactPreference")} />
              By e-mail
            </label>
            <label className="flex items-center gap-2">
              <input type="radio" value="phone" {...register("contactPreference")} />
              By phone
            </label>
          </div>
          {errors.contactPreference ? (
            <p id="contactPreference-error" className="field-error" role="alert">
              {errors.contactPreference.message}
            </p>
          ) : null}
        </fieldset>
      </fieldset>

      <SetProfileFields register={register} errors={errors} control={control} wording={STAFF_WORDING} />

      <fieldset className="space-y-4">
        <legend className="font-serif text-xl font-bold">Photos</legend>
        <p id="photos-hint" className="text-bakelite-soft">
          Photos of the set as it came in: the cabinet, the dial, the back and anything broken. Location and camera details are removed.
        </p>
        <PhotoPicker
          optional
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

      <section aria-labelledby="intake-cautions" className="space-y-3">
        <Notice tone="caution" title="Tell the customer before the set goes">
          <ul id="intake-cautions" className="list-disc space-y-1 pl-5">
            {CAUTIONS.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </Notice>
        <label className="flex items-start gap-3">
          <input
            type="checkbox"
            className="mt-1"
            {...register("cautionsGiven")}
            aria-invalid={!!errors.cautionsGiven}
            aria-describedby={errors.cautionsGiven ? "cautionsGiven-error" : undefined}
          />
          <span>I have told the customer these cautions.</span>
        </label>
        {errors.cautionsGiven ? (
          <p id="cautionsGiven-error" className="field-error" role="alert">
            {errors.cautionsGiven.message}
          </p>
        ) : null}
      </section>

      <div className="flex flex-wrap items-center gap-4">
        <button type="submit" className="btn-primary px-6 py-3 text-base" disabled={isSubmitting || submit.isPending}>
          {submit.isPending ? "Opening the job…" : "Open the job"}
        </button>
        {uploading ? <p className="text-sm text-bakelite-muted">Photos are still uploading…</p> : null}
      </div>
    </form>
  );
}
