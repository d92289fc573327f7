"use client";

import { useWatch, type Control, type FieldErrors, type Path, type UseFormRegister } from "react-hook-form";
import type { z } from "zod";
import { describedBy, Field } from "@/components/ui/field";
import {
  BAND_LABEL,
  DIAL_BANDS,
  POWERED_LABEL,
  POWERED_RECENTLY,
  SET_KIND_HELP,
  SET_KINDS,
  type setProfileShape,
} from "@/lib/validation/quote";

type SetProfileObject = z.ZodObject<typeof setProfileShape>;
/** The set-profile part of a form: the online quote request and counter intake both hold these fields. */
export type SetProfileValues = z.input<SetProfileObject>;

export type SetProfileWording = {
  setLegend: string;
  setIntro: string;
  problemLegend: string;
  symptomsLabel: string;
  poweredLabel: string;
};

export const OWNER_WORDING: SetProfileWording = {
  setLegend: "Your set",
  setIntro: "Copy the names as they are printed on the cabinet, the dial or the label on the back.",
  problemLegend: "What is wrong with it",
  symptomsLabel: "What does it do, or not do?",
  poweredLabel: "Has it been plugged in or switched on recently?",
};

/**
 * The set and what is wrong with it, as the online quote request asks: the same fields, labels and errors
 * wherever a set profile is entered (the owner online, staff at the counter or on the phone).
 */
export function SetProfileFields<T extends SetProfileValues>({
  register: registerAny,
  errors: errorsAny,
  control: controlAny,
  wording = OWNER_WORDING,
}: {
  register: UseFormRegister<T>;
  errors: FieldErrors<T>;
  control: Control<T>;
  wording?: SetProfileWording;
}) {
  // The fields below are the set-profile ones every such form holds; narrowing once keeps the paths checked.
  const register = registerAny as unknown as UseFormRegister<SetProfileValues>;
  const errors = errorsAny as unknown as FieldErrors<SetProfileValues>;
  const control = controlAny as unknown as Control<SetProfileValues>;
  const tickedBands = (useWatch({ control, name: "bands" }) ?? []) as (typeof DIAL_BANDS)[number][];
  const input = (id: Path<SetProfileValues>, hint?: boolean) => ({
    id,
    className: "field-input",
    "aria-invalid": !!errors[id as keyof typeof errors],
    "aria-describedby": describedBy(id, { error: errors[id as keyof typeof errors], hint }),
  });

  return (
    <>
      <fieldset className="space-y-5">
        <legend className="font-serif text-xl font-bold">{wording.setLegend}</legend>
        <p className="text-bakelite-soft">{wording.setIntro}</p>
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
                        {...register(`dialEnds.${b}.${which}` as Path<SetProfileValues>)}
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
        <legend className="font-serif text-xl font-bold">{wording.problemLegend}</legend>
        <Field
          id="symptoms"
          label={wording.symptomsLabel}
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
          <legend className="field-label">{wording.poweredLabel}</legend>
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
    </>
  );
}
