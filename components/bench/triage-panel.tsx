"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useFieldArray, useForm, useWatch, type FieldPath } from "react-hook-form";
import { z } from "@/lib/engine/zod";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { bandKinds } from "@/lib/engine/bands/band";
import { setKindLabels, setKinds, symptomFlags } from "@/lib/engine/checklist/profile";
import { declineSchema, profileUpdateSchema, questionSchema } from "@/lib/validation/bench";
import { api, ApiError, errorText, retryLostAnswer } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import type { JobDetailJson } from "./types";

type ProfileForm = z.input<typeof profileUpdateSchema>;
type ProfileOut = z.output<typeof profileUpdateSchema>;

const BAND_DEFAULTS = {
  LW: { lowKHz: 150, highKHz: 350, ifKHz: 455 },
  MW: { lowKHz: 540, highKHz: 1600, ifKHz: 455 },
  SW: { lowKHz: 5900, highKHz: 18000, ifKHz: 455 },
  FM: { lowKHz: 88000, highKHz: 108000, ifKHz: 10700 },
} as const;

const orBlank = (v: unknown) => (v === undefined || v === null ? "" : v);
const blankToUndefined = (v: unknown) => (v === "" || v === null ? undefined : v);

function defaultsFrom(detail: JobDetailJson): ProfileForm {
  const p = (detail.set.profile ?? {}) as Record<string, unknown>;
  const bands = Array.isArray(p.bands) ? (p.bands as Record<string, unknown>[]) : [];
  return {
    maker: detail.set.maker,
    model: detail.set.model,
    year: detail.set.year ?? "",
    profile: {
      kind: (setKinds as readonly string[]).includes(String(p.kind)) ? (p.kind as ProfileOut["profile"]["kind"]) : detail.set.kind,
      bands: bands.length
        ? bands.map((b) => ({
            kind: (bandKinds as readonly string[]).includes(String(b.kind)) ? (b.kind as "MW") : "MW",
            label: typeof b.label === "string" ? b.label : "",
            lowKHz: orBlank(b.lowKHz),
            highKHz: orBlank(b.highKHz),
            ifKHz: orBlank(b.ifKHz),
            injection: b.injection === "low" ? "low" : undefined,
            trackingPointsKHz: Array.isArray(b.trackingPointsKHz) ? (b.trackingPointsKHz as number[]).join(", ") : "",
          }))
        : [{ kind: "MW", label: "", ...BAND_DEFAULTS.MW }],
      electrolytics: orBlank(p.electrolytics) === "" ? 0 : p.electrolytics,
      paperCapacitors: orBlank(p.paperCapacitors) === "" ? 0 : p.paperCapacitors,
      tubes: p.tubes ?? undefined,
      transistors: p.transistors ?? undefined,
      ifTransformers: p.ifTransformers ?? undefined,
      ifTransformersFm: p.ifTransformersFm ?? undefined,
      seleniumRectifier: p.seleniumRectifier === true,
      lineCordWorn: p.lineCordWorn === true,
      dialCordBroken: p.dialCordBroken === true,
      batteryCorrosion: p.batteryCorrosion === true,
      mainsVolts: p.mainsVolts ?? undefined,
      bPlusVolts: p.bPlusVolts ?? undefined,
      symptoms: Array.isArray(p.symptoms) ? (p.symptoms as ProfileOut["profile"]["symptoms"]) : [],
    },
  };
}

function useStateChange(jobId: string) {
  const qc = useQueryClient();
  return () => {
    void qc.invalidateQueries({ queryKey: benchKeys.job(jobId) });
    void qc.invalidateQueries({ queryKey: benchKeys.queues() });
    void qc.invalidateQueries({ queryKey: benchKeys.estimate(jobId) });
    void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) });
    void qc.invalidateQueries({ queryKey: benchKeys.messages(jobId) });
  };
}

// Remounted whenever the stored profile changes (its key is the set's updated-at), so the "saved" notice
// lives in the parent and survives the refetch that follows a save.
function ProfileEditor({ detail, saved, setSaved }: { detail: JobDetailJson; saved: boolean; setSaved: (v: boolean) => void }) {
  const jobId = detail.job.id;
  const qc = useQueryClient();
  const form = useForm<ProfileForm, unknown, ProfileOut>({
    resolver: zodResolver(profileUpdateSchema),
    defaultValues: defaultsFrom(detail),
    mode: "onBlur",
  });
  const { register, control, handleSubmit, formState, setError } = form;
  const bands = useFieldArray({ control, name: "profile.bands" });
  const kind = useWatch({ control, name: "profile.kind" });
  const tube = kind === "tube-acdc" || kind === "tube-transformer";
  const bandKindsWatched = (useWatch({ control, name: "profile.bands" }) ?? []).map((b) => b?.kind);
  // An AM/FM set aligns two IF strips, each with its own transformers.
  const twoStrips = bandKindsWatched.includes("FM") && bandKindsWatched.some((k) => k !== "FM");
  const save = useMutation({
    mutationFn: (body: ProfileOut) => api(`/api/bench/jobs/${jobId}/profile`, { method: "PUT", body }),
    onSuccess: () => {
      setSaved(true);
      void qc.invalidateQueries({ queryKey: benchKeys.job(jobId) });
      void qc.invalidateQueries({ queryKey: benchKeys.estimate(jobId) });
      void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) });
      void qc.invalidateQueries({ queryKey: benchKeys.queues() });
    },
    onError: (e) => {
      if (e instanceof ApiError) for (const [k, m] of Object.entries(e.fields)) setError(k as FieldPath<ProfileForm>, { message: m });
    },
  });
  const err = formState.errors;
  const pe = err.profile;
  const num = (name: FieldPath<ProfileForm>, label: string, hint?: string, optional = false) => {
    const id = `tri-${name.replaceAll(".", "-")}`;
    const parts = name.split(".");
    let e: unknown = err;
    for (const part of parts) e = (e as Record<string, unknown> | undefined)?.[part];
    const message = (e as { message?: string } | undefined)?.message;
    return (
      <Field id={id} label={label} error={message} hint={hint}>
        <input
          id={id}
          inputMode="numeric"
          className="field-input figure py-1"
          aria-invalid={message ? true : undefined}
          aria-describedby={describedBy(id, { error: message, hint })}
          {...register(name, optional ? { setValueAs: blankToUndefined } : {})}
        />
      </Field>
    );
  };

  return (
    <form
      noValidate
      className="card space-y-3 p-3"
      aria-labelledby="profile-heading"
      onSubmit={handleSubmit((v) => {
        setSaved(false);
        save.mutate(v);
      })}
    >
      <h3 id="profile-heading" className="text-lg font-semibold">
        Set profile
      </h3>
      <p className="text-sm text-bakelite-muted">The checklist, the estimate and the bench sheet are computed from this profile.</p>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
        <Field id="tri-maker" label="Maker" error={err.maker?.message}>
          <input id="tri-maker" className="field-input py-1" aria-invalid={err.maker ? true : undefined} {...register("maker")} />
        </Field>
        <Field id="tri-model" label="Model" error={err.model?.message}>
          <input id="tri-model" className="field-input py-1" aria-invalid={err.model ? true : undefined} {...register("model")} />
        </Field>
        {num("year", "Year", undefined, false)}
        <div className="col-span-2">
          <Field id="tri-kind" label="Kind of set" error={pe?.kind?.message}>
            <select id="tri-kind" className="field-input py-1" {...register("profile.kind")}>
              {setKinds.map((k) => (
                <option key={k} value={k}>
                  {setKindLabels[k]}
                </option>
              ))}
            </select>
          </Field>
        </div>
      </div>

      {/* min-w-0: a fieldset is at least as wide as its content by default, which would carry the band table
          past the card instead of letting its box scroll. */}
      <fieldset className="min-w-0 space-y-2">
        <legend className="field-label">Bands, as printed on the dial (kHz, FM too: 88–108 MHz is 88000–108000)</legend>
        {pe?.bands?.message ? <p className="field-error">{pe.bands.message}</p> : null}
        <div className="overflow-x-auto">
          <table className="dense-table [&_td]:px-1 [&_th]:px-1" data-testid="band-table">
            <thead>
              <tr>
                <th scope="col">Band</th>
                <th scope="col">Label</th>
                <th scope="col">Dial low, kHz</th>
                <th scope="col">Dial high, kHz</th>
                <th scope="col">IF, kHz</th>
                <th scope="col">LO</th>
                <th scope="col">Manual tracking points, kHz</th>
                <th scope="col">
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {bands.fields.map((f, i) => {
                const be = pe?.bands?.[i];
                const cell = (name: "lowKHz" | "highKHz" | "ifKHz", label: string) => {
                  const id = `tri-band-${i}-${name}`;
                  const message = be?.[name]?.message;
                  return (
                    <td>
                      <label htmlFor={id} className="sr-only">
                        Band {i + 1} {label}
                      </label>
                      <input
                        id={id}
                        inputMode="decimal"
                        className="field-input figure mt-0 w-20 px-1.5 py-1"
                        aria-invalid={message ? true : undefined}
                        aria-describedby={message ? `${id}-error` : undefined}
                        {...register(`profile.bands.${i}.${name}`)}
                      />
                      {message ? (
                        <p id={`${id}-error`} className="field-error">
                          {message}
                        </p>
                      ) : null}
                    </td>
                  );
                };
                return (
                  <tr key={f.id}>
                    <td>
                      <label htmlFor={`tri-band-${i}-kind`} className="sr-only">
                        Band {i + 1} kind
                      </label>
                      <select
                        id={`tri-band-${i}-kind`}
                        className="field-input mt-0 w-16 px-1.5 py-1"
                        {...register(`profile.bands.${i}.kind`)}
                      >
                        {bandKinds.map((k) => (
                          <option key={k}>{k}</option>
                        ))}
                      </select>
                    </td>
                    <td>
                      <label htmlFor={`tri-band-${i}-label`} className="sr-only">
                        Band {i + 1} label
                      </label>
                      <input
                        id={`tri-band-${i}-label`}
                        className="field-input mt-0 w-20 px-1.5 py-1"
                        {...register(`profile.bands.${i}.label`)}
                      />
                    </td>
                    {cell("lowKHz", "dial low")}
                    {cell("highKHz", "dial high")}
                    {cell("ifKHz", "IF")}
                    <td>
                      <label htmlFor={`tri-band-${i}-inj`} className="sr-only">
                        Band {i + 1} oscillator side
                      </label>
                      <select
                        id={`tri-band-${i}-inj`}
                        className="field-input mt-0 w-28 px-1.5 py-1"
                        {...register(`profile.bands.${i}.injection`, { setValueAs: blankToUndefined })}
                      >
                        <option value="">above signal</option>
                        <option value="low">below signal</option>
                      </select>
                    </td>
                    <td>
                      <label htmlFor={`tri-band-${i}-points`} className="sr-only">
                        Band {i + 1} tracking points from the service manual (optional)
                      </label>
                      <input
                        id={`tri-band-${i}-points`}
                        className="field-input figure mt-0 w-28 px-1.5 py-1"
                        placeholder="usual"
                        aria-invalid={be?.trackingPointsKHz ? true : undefined}
                        aria-describedby={be?.trackingPointsKHz ? `tri-band-${i}-points-error` : undefined}
                        {...register(`profile.bands.${i}.trackingPointsKHz`)}
                      />
                      {be?.trackingPointsKHz ? (
                        <p id={`tri-band-${i}-points-error`} className="field-error">
                          {(be.trackingPointsKHz as { message?: string }).message ??
                            (be.trackingPointsKHz as { message?: string }[])?.find?.((x) => x?.message)?.message}
                        </p>
                      ) : null}
                    </td>
                    <td>
                      <button
                        type="button"
                        className="btn-quiet px-1 py-0.5"
                        onClick={() => bands.remove(i)}
                        disabled={bands.fields.length === 1}
                        aria-label={`Remove band ${i + 1}`}
                      >
                        <span aria-hidden="true">✕</span>
                      </button>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <div className="flex flex-wrap gap-2">
          {bandKinds.map((k) => (
            <button
              key={k}
              type="button"
              className="btn-secondary px-2 py-1"
              onClick={() => bands.append({ kind: k, label: "", ...BAND_DEFAULTS[k] })}
            >
              + {k} band
            </button>
          ))}
        </div>
      </fieldset>

      <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
        {num("profile.electrolytics", "Electrolytic capacitors")}
        {num("profile.paperCapacitors", "Paper capacitors")}
        {tube ? num("profile.tubes", "Tubes", undefined, true) : num("profile.transistors", "Transistors", undefined, true)}
        {twoStrips ? (
          <>
            {num("profile.ifTransformers", "IF transformers, AM strip", "Leave empty for the usual two.", true)}
            {num("profile.ifTransformersFm", "IF transformers, FM strip", "Leave empty for the usual three.", true)}
          </>
        ) : (
          num("profile.ifTransformers", "IF transformers", "Leave empty for the usual count.", true)
        )}
        {tube ? num("profile.bPlusVolts", "B+ on the schematic, V", "Gives the B+ reading a target.", true) : null}
        <Field id="tri-mains" label="Mains voltage" error={pe?.mainsVolts?.message}>
          <select id="tri-mains" className="field-input py-1" {...register("profile.mainsVolts", { setValueAs: blankToUndefined })}>
            <option value="">120 V (default)</option>
            <option value="120">120 V</option>
            <option value="230">230 V</option>
          </select>
        </Field>
      </div>

      <fieldset>
        <legend className="field-label">Condition</legend>
        <div className="mt-1 flex flex-wrap gap-x-5 gap-y-1 text-sm">
          {(
            [
              ["seleniumRectifier", "Selenium rectifier present"],
              ["lineCordWorn", "Line cord worn"],
              ["dialCordBroken", "Dial cord broken or slipping"],
              ["batteryCorrosion", "Battery corrosion"],
            ] as const
          )
            // A battery set has no rectifier and no line cord.
            .filter(([name]) => kind !== "transistor-battery" || (name !== "seleniumRectifier" && name !== "lineCordWorn"))
            .map(([name, label]) => (
              <label key={name} className="inline-flex items-center gap-1.5">
                <input type="checkbox" {...register(`profile.${name}`)} />
                {label}
              </label>
            ))}
        </div>
      </fieldset>
      <fieldset>
        <legend className="field-label">Reported symptoms</legend>
        <div className="mt-1 flex flex-wrap gap-x-5 gap-y-1 text-sm">
          {symptomFlags.map((s) => (
            <label key={s} className="inline-flex items-center gap-1.5">
              <input type="checkbox" value={s} {...register("profile.symptoms")} />
              {s.replace("-", " ")}
            </label>
          ))}
        </div>
      </fieldset>

      {save.isError ? (
        <Notice tone="error" live>
          {errorText(save.error)}
        </Notice>
      ) : null}
      {saved ? (
        <Notice tone="success" live>
          Profile saved. Rebuild the estimate from the checklist if the work changed.
        </Notice>
      ) : null}
      <button type="submit" className="btn-primary" disabled={save.isPending}>
        {save.isPending ? "Saving…" : "Save profile"}
      </button>
    </form>
  );
}

const questionText = z.object({ text: questionSchema.shape.question });
const declineText = z.object({ text: declineSchema.shape.reason });

function MessageForm({ jobId, kind }: { jobId: string; kind: "question" | "decline" }) {
  const onChange = useStateChange(jobId);
  const form = useForm<{ text: string }>({
    resolver: zodResolver(kind === "question" ? questionText : declineText),
    defaultValues: { text: "" },
  });
  // A question is a message: one key per composed question, kept across its retries, renewed once stored.
  const [idempotencyKey, setIdempotencyKey] = useState(() => crypto.randomUUID());
  const m = useMutation({
    mutationFn: ({ text, key }: { text: string; key: string }) =>
      api(`/api/bench/jobs/${jobId}/${kind}`, {
        method: "POST",
        body: kind === "question" ? { question: text, idempotencyKey: key } : { reason: text },
      }),
    retry: kind === "question" ? retryLostAnswer : false,
    onSuccess: () => {
      form.reset({ text: "" });
      setIdempotencyKey(crypto.randomUUID());
      onChange();
    },
    onError: (e) => {
      if (e instanceof ApiError) {
        if (e.fields.idempotencyKey) {
          setIdempotencyKey(crypto.randomUUID());
          onChange();
        }
        const message = e.fields.question ?? e.fields.reason;
        if (message) form.setError("text", { message });
      }
    },
  });
  const id = `tri-${kind}`;
  const error = form.formState.errors.text?.message;
  const hint =
    kind === "question"
      ? "The owner gets it by e-mail and on their job page; the job waits for their answer."
      : "The owner sees this reason. The job closes.";
  return (
    <form noValidate className="card space-y-2 p-3" onSubmit={form.handleSubmit((v) => m.mutate({ text: v.text, key: idempotencyKey }))}>
      <Field id={id} label={kind === "question" ? "Ask the owner a question" : "Decline the job"} error={error} hint={hint}>
        <textarea
          id={id}
          rows={3}
          className="field-input"
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, { error, hint })}
          {...form.register("text")}
        />
      </Field>
      {m.isError ? (
        <Notice tone="error" live>
          {errorText(m.error)}
        </Notice>
      ) : null}
      <button
        type="submit"
        className={kind === "question" ? "btn-secondary" : "btn-secondary border-fail text-fail"}
        disabled={m.isPending}
      >
        {kind === "question" ? "Send question" : "Decline job"}
      </button>
    </form>
  );
}

export function TriagePanel({ detail }: { detail: JobDetailJson }) {
  const [profileSaved, setProfileSaved] = useState(false);
  const jobId = detail.job.id;
  const onChange = useStateChange(jobId);
  const start = useMutation({ mutationFn: () => api(`/api/bench/jobs/${jobId}/triage`, { method: "POST" }), onSuccess: onChange });
  const state = detail.job.state;
  return (
    <div className="space-y-3">
      {state === "requested" ? (
        <div className="card flex flex-wrap items-center gap-3 p-3">
          <p className="text-sm">This request has not been picked up yet.</p>
          <button type="button" className="btn-primary" onClick={() => start.mutate()} disabled={start.isPending}>
            Pick up for triage
          </button>
          {start.isError ? <p className="field-error">{errorText(start.error)}</p> : null}
        </div>
      ) : null}
      {state === "awaiting_owner" ? <Notice tone="info">Waiting for the owner to answer the shop&apos;s question.</Notice> : null}

      <div className="grid grid-cols-1 gap-3 lg:grid-cols-3">
        <section className="card min-w-0 space-y-2 p-3 text-sm lg:col-span-1" aria-labelledby="request-heading">
          <h3 id="request-heading" className="text-lg font-semibold">
            What the owner wrote
          </h3>
          <dl className="space-y-1">
            <dt className="font-semibold">Symptoms</dt>
            <dd className="whitespace-pre-wrap">{detail.job.symptoms || "—"}</dd>
            <dt className="font-semibold">Work already done</dt>
            <dd className="whitespace-pre-wrap">{detail.job.priorWork || "—"}</dd>
            <dt className="font-semibold">Powered recently</dt>
            <dd>{detail.job.poweredRecently}</dd>
            <dt className="font-semibold">Delivery</dt>
            <dd>{detail.job.delivery}</dd>
            <dt className="font-semibold">How to reach the owner</dt>
            <dd data-testid="owner-contact">
              {detail.job.contactPreference === "phone" ? (
                <>
                  By phone
                  {detail.customer.phone ? (
                    <>
                      : <a href={`tel:${detail.customer.phone}`}>{detail.customer.phone}</a>
                    </>
                  ) : (
                    " (no number given)"
                  )}
                  <span className="block text-bakelite-muted">E-mail: {detail.customer.email ?? "none given"}</span>
                </>
              ) : (
                <>
                  By e-mail: {detail.customer.email ?? "no address given"}
                  {detail.customer.phone ? <span className="block text-bakelite-muted">Phone: {detail.customer.phone}</span> : null}
                </>
              )}
            </dd>
            <dt className="font-semibold">Numbers at the ends of the dial scales</dt>
            <dd data-testid="owner-dial-ends">
              {detail.ownerReport.dialEnds.length ? (
                <ul>
                  {detail.ownerReport.dialEnds.map((e) => (
                    <li key={e.band} className="figure">
                      {e.band}: {e.low ?? "?"} – {e.high ?? "?"}
                    </li>
                  ))}
                </ul>
              ) : null}
              {detail.ownerReport.dialMarkings ? <p className="whitespace-pre-wrap">{detail.ownerReport.dialMarkings}</p> : null}
              {!detail.ownerReport.dialEnds.length && !detail.ownerReport.dialMarkings ? "—" : null}
            </dd>
          </dl>
          {detail.photos.length ? (
            <ul className="grid grid-cols-3 gap-1" aria-label="Owner's photos">
              {detail.photos.map((p) => (
                <li key={p.id}>
                  <a href={p.url} target="_blank" rel="noreferrer">
                    {/* eslint-disable-next-line @next/next/no-img-element -- photos come re-encoded from our own authorised route; the image optimiser would fetch them without the session */}
                    <img src={p.thumbUrl} alt={p.displayName} className="h-20 w-full rounded object-cover" />
                  </a>
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-bakelite-muted">No photos.</p>
          )}
          <p className="text-bakelite-muted">Messages and workshop notes are in the thread below the tabs.</p>
        </section>
        {/* min-w-0: a grid item is otherwise as wide as its widest content, and the band table would push the
            card past its column instead of scrolling inside it. */}
        <div className="min-w-0 space-y-3 lg:col-span-2">
          <ProfileEditor key={detail.set.updatedAt} detail={detail} saved={profileSaved} setSaved={setProfileSaved} />
          {state === "in_triage" ? (
            <div className="grid gap-3 md:grid-cols-2">
              <MessageForm jobId={jobId} kind="question" />
              <MessageForm jobId={jobId} kind="decline" />
            </div>
          ) : null}
        </div>
      </div>
    </div>
  );
}
