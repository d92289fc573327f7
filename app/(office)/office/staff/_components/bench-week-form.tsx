"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { WEEKDAY_NAMES } from "@/lib/engine/forecast/turnaround";
import { BENCH_WEEK_FIELDS, benchWeekSchema, type BenchWeekInput, type BenchWeekValues } from "@/lib/validation/bench-week";
import { saveBenchWeek } from "../bench-time-actions";

type Person = { id: string; name: string; assumed: boolean; minutes: readonly number[]; daysOff: string[] };

// One person's bench week: hours per weekday and the days off the forecast skips.
export function BenchWeekForm({ person }: { person: Person }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const defaults: BenchWeekInput = {
    userId: person.id,
    ...Object.fromEntries(BENCH_WEEK_FIELDS.map((f, i) => [f, String((person.minutes[i] ?? 0) / 60)])),
    daysOff: person.daysOff.join("\n"),
  } as BenchWeekInput;
  const { register, handleSubmit, formState, setError, getValues } = useForm<BenchWeekInput, unknown, BenchWeekValues>({
    resolver: zodResolver(benchWeekSchema),
    defaultValues: defaults,
  });
  const { errors } = formState;
  // The fields are checked here first; the server gets them as typed and checks them again.
  const onSubmit = handleSubmit(async () => {
    setMessage(null);
    const r = await saveBenchWeek(getValues());
    if (r.ok) {
      setMessage({ tone: "success", text: `Bench week saved for ${person.name}.` });
      router.refresh();
      return;
    }
    for (const [field, text] of Object.entries(r.error.fields ?? {})) setError(field as keyof BenchWeekInput, { message: text });
    setMessage({ tone: "error", text: r.error.message });
  });
  const base = `bw-${person.id}`;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label={`Bench week of ${person.name}`}>
      <input type="hidden" {...register("userId")} />
      <fieldset>
        <legend className="field-label">
          Bench hours per day{person.assumed ? " (not set yet: the forecast assumes the hours shown)" : ""}
        </legend>
        <div className="mt-1 grid grid-cols-2 gap-2 sm:grid-cols-4 lg:grid-cols-7">
          {BENCH_WEEK_FIELDS.map((f, i) => (
            <Field key={f} id={`${base}-${f}`} label={WEEKDAY_NAMES[i]} error={errors[f]?.message} className="min-w-0">
              <input
                id={`${base}-${f}`}
                inputMode="decimal"
                className="field-input w-full min-w-0"
                aria-invalid={!!errors[f]}
                aria-describedby={describedBy(`${base}-${f}`, { error: errors[f] })}
                {...register(f)}
              />
            </Field>
          ))}
        </div>
      </fieldset>
      <Field
        id={`${base}-off`}
        label="Days off"
        hint="One date a line, as YYYY-MM-DD: holidays, leave, fairs. The forecast gives these days no bench time."
        error={errors.daysOff?.message}
      >
        <textarea
          id={`${base}-off`}
          rows={3}
          className="field-input w-full min-w-0 font-mono text-sm"
          aria-invalid={!!errors.daysOff}
          aria-describedby={describedBy(`${base}-off`, { error: errors.daysOff, hint: true })}
          {...register("daysOff")}
        />
      </Field>
      <button
        type="submit"
        className="btn-secondary max-w-full text-left [overflow-wrap:anywhere] whitespace-normal"
        disabled={formState.isSubmitting}
      >
        Save bench week of {person.name}
      </button>
      {message ? (
        <Notice tone={message.tone} live>
          <p>{message.text}</p>
        </Notice>
      ) : null}
    </form>
  );
}
