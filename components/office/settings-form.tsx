"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { get, useForm, useWatch, type FieldErrors, type Path, type UseFormRegister } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { bandKinds } from "@/lib/engine/bands/band";
import { checklistCategories, ruleCategory } from "@/lib/engine/checklist/rules";
import type { SettingsSnapshot } from "@/lib/server/services/settings";
import { coveredWording, exclusionWording, settingsFormSchema, type SettingsFormValues } from "@/lib/validation/office";
import { coveredWordingKeys, exclusionCodes } from "@/lib/engine/warranty/exclusions";
import { leakageCeilings } from "@/lib/engine/verdicts/tolerances";
import { ApiError, officeFetch } from "@/lib/client/office-api";
import { formatWhen } from "./format";
import { BAND_KIND_LABEL, CATEGORY_LABEL, RULE_LABEL } from "./labels";
import { officeKeys } from "@/lib/client/office-query-keys";

type Errors = FieldErrors<SettingsFormValues>;

function errorAt(errors: Errors, name: string): string | undefined {
  const e = get(errors, name) as { message?: string } | undefined;
  return e?.message;
}

// One labelled input wired to its hint and error.
function TextField({
  name,
  label,
  hint,
  register,
  errors,
  suffix,
  prefix,
  type = "text",
  inputMode,
  number,
  className = "",
  list,
}: {
  name: Path<SettingsFormValues>;
  label: string;
  hint?: string;
  register: UseFormRegister<SettingsFormValues>;
  errors: Errors;
  suffix?: string;
  prefix?: string;
  type?: string;
  inputMode?: "decimal" | "numeric" | "email" | "tel";
  number?: boolean;
  className?: string;
  /** Id of a datalist of suggestions. */
  list?: string;
}) {
  const id = `f-${name.replaceAll(".", "-")}`;
  const error = errorAt(errors, name);
  return (
    <Field id={id} label={label} error={error} hint={hint} className={className}>
      <div className="flex items-center gap-2">
        {prefix ? <span className="figure mt-1 text-sm text-bakelite-soft">{prefix}</span> : null}
        <input
          id={id}
          type={type}
          step={type === "number" ? "any" : undefined}
          inputMode={inputMode}
          list={list}
          className={`field-input ${number || inputMode === "decimal" ? "figure" : ""}`}
          aria-invalid={!!error}
          aria-describedby={describedBy(id, { error, hint })}
          {...register(name, number ? { valueAsNumber: true } : {})}
        />
        {suffix ? <span className="mt-1 whitespace-nowrap text-sm text-bakelite-soft">{suffix}</span> : null}
      </div>
    </Field>
  );
}

function TextArea({
  name,
  label,
  hint,
  register,
  errors,
  rows = 3,
}: {
  name: Path<SettingsFormValues>;
  label: string;
  hint?: string;
  register: UseFormRegister<SettingsFormValues>;
  errors: Errors;
  rows?: number;
}) {
  const id = `f-${name.replaceAll(".", "-")}`;
  const error = errorAt(errors, name);
  return (
    <Field id={id} label={label} error={error} hint={hint}>
      <textarea
        id={id}
        rows={rows}
        className="field-input"
        aria-invalid={!!error}
        aria-describedby={describedBy(id, { error, hint })}
        {...register(name)}
      />
    </Field>
  );
}

// A number cell in a dense table: the label is the row and column, read out by screen readers.
function CellInput({
  name,
  label,
  register,
  errors,
  step = "any",
}: {
  name: Path<SettingsFormValues>;
  label: string;
  register: UseFormRegister<SettingsFormValues>;
  errors: Errors;
  step?: string;
}) {
  const id = `f-${name.replaceAll(".", "-")}`;
  const error = errorAt(errors, name);
  return (
    <>
      <label htmlFor={id} className="sr-only">
        {label}
      </label>
      <input
        id={id}
        type="number"
        step={step}
        className="figure w-24 rounded-card border border-bakelite-muted bg-white px-2 py-1 text-right"
        aria-invalid={!!error}
        aria-describedby={error ? `${id}-error` : undefined}
        {...register(name, { valueAsNumber: true })}
      />
      {error ? (
        <p id={`${id}-error`} className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </>
  );
}

function Section({ id, title, intro, children }: { id: string; title: string; intro?: string; children: React.ReactNode }) {
  return (
    <section aria-labelledby={id} className="card scroll-mt-4 p-5">
      <h2 id={id} className="text-xl font-semibold">
        {title}
      </h2>
      {intro ? <p className="mt-1 max-w-prose text-sm text-bakelite-soft">{intro}</p> : null}
      <div className="mt-4 space-y-4">{children}</div>
    </section>
  );
}

const SECTIONS = [
  ["s-identity", "Shop identity"],
  ["s-labour", "Labour and billing"],
  ["s-minutes", "Minutes per checklist rule"],
  ["s-parts", "Parts and markup"],
  ["s-tax", "Tax and deposit"],
  ["s-warranty", "Warranty"],
  ["s-tolerances", "Tolerances"],
] as const;

type Problem = { kind: "stale" | "invalid" | "other"; message: string } | null;

export function SettingsForm({ initial, timeZones }: { initial: SettingsSnapshot; timeZones: string[] }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [snapshot, setSnapshot] = useState(initial);
  const [problem, setProblem] = useState<Problem>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const form = useForm<SettingsFormValues>({ resolver: zodResolver(settingsFormSchema), defaultValues: initial.values, mode: "onBlur" });
  const { register, handleSubmit, formState, setError, reset, setValue, control, getValues } = form;
  const { errors } = formState;
  const currency = initial.values.currency.code;

  const designation = useWatch({ control, name: "warranty.designation" });
  const steps = useWatch({ control, name: "warrantyTerms.howToClaim" });

  const save = useMutation({
    mutationFn: (values: SettingsFormValues) => officeFetch<SettingsSnapshot>("/api/office/settings", { method: "PUT", json: values }),
    onSuccess: (next) => {
      queryClient.setQueryData(officeKeys.settings(), next);
      const zoneChanged = next.values.identity.timeZone !== snapshot.values.identity.timeZone;
      setSnapshot(next);
      reset(next.values);
      setProblem(null);
      // The area's layout hands the zone to every client component: render it again with the new one.
      if (zoneChanged) router.refresh();
      setSaved(`Saved at ${formatWhen(next.updatedAt, next.values.identity.timeZone)}. Estimates priced from now on use these figures.`);
    },
    onError: (e) => {
      setSaved(null);
      if (e instanceof ApiError && e.status === 409 && e.code === "stale") {
        setProblem({ kind: "stale", message: e.message });
        return;
      }
      if (e instanceof ApiError && e.fields) {
        for (const [path, message] of Object.entries(e.fields)) setError(path as Path<SettingsFormValues>, { type: "server", message });
        setProblem({ kind: "invalid", message: "Some fields need attention; they are marked below." });
        return;
      }
      setProblem({
        kind: "other",
        message: e instanceof Error ? e.message : "The settings could not be saved. Nothing was lost; try again.",
      });
    },
  });

  const onSubmit = handleSubmit(
    (values) => save.mutate(values),
    () => {
      setSaved(null);
      setProblem({ kind: "invalid", message: "Some fields need attention; they are marked below. Nothing was saved yet." });
    },
  );

  // After a 409: fetch what is saved now, either to look at it (dropping the edits) or to save over it.
  const latest = async () => {
    const next = await officeFetch<SettingsSnapshot>("/api/office/settings");
    queryClient.setQueryData(officeKeys.settings(), next);
    setSnapshot(next);
    return next;
  };
  const loadTheirs = async () => {
    try {
      const next = await latest();
      reset(next.values);
      setProblem(null);
      setSaved(
        `Showing the version saved at ${formatWhen(next.updatedAt, next.values.identity.timeZone)}${next.updatedByName ? ` by ${next.updatedByName}` : ""}. Your edits were set aside.`,
      );
    } catch (e) {
      setProblem({ kind: "other", message: e instanceof Error ? e.message : "Could not load the saved version." });
    }
  };
  const keepMine = async () => {
    try {
      const next = await latest();
      setValue("version", next.version);
      await onSubmit();
    } catch (e) {
      setProblem({ kind: "other", message: e instanceof Error ? e.message : "Could not load the saved version." });
    }
  };

  const addStep = () => setValue("warrantyTerms.howToClaim", [...(getValues("warrantyTerms.howToClaim") ?? []), ""], { shouldDirty: true });
  const removeStep = (i: number) =>
    setValue(
      "warrantyTerms.howToClaim",
      (getValues("warrantyTerms.howToClaim") ?? []).filter((_, j) => j !== i),
      { shouldDirty: true },
    );

  const rulesByCategory = checklistCategories.map((cat) => ({
    cat,
    rules: initial.values.minutesPerRule.map((r, i) => ({ ...r, i })).filter((r) => ruleCategory[r.code] === cat),
  }));

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      <input type="hidden" {...register("version", { valueAsNumber: true })} />
      <nav aria-label="Settings sections" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        {SECTIONS.map(([id, title]) => (
          <a key={id} href={`#${id}`}>
            {title}
          </a>
        ))}
      </nav>
      <p className="text-sm text-bakelite-soft">
        Version <span className="figure">{snapshot.version}</span>
        {snapshot.updatedAt ? (
          <>
            {" "}
            · last saved {formatWhen(snapshot.updatedAt, snapshot.values.identity.timeZone)}
            {snapshot.updatedByName ? ` by ${snapshot.updatedByName}` : ""}
          </>
        ) : null}
      </p>

      <Section
        id="s-identity"
        title="Shop identity"
        intro="Printed on every warranty certificate, receipt and invoice, and in the e-mails to set owners."
      >
        <div className="grid gap-4 md:grid-cols-2">
          <TextField name="identity.name" label="Shop name" register={register} errors={errors} />
          <TextArea
            name="identity.addressText"
            label="Address"
            hint="Each address line on its own line, as it should be printed."
            register={register}
            errors={errors}
            rows={4}
          />
          <TextField name="identity.phone" label="Phone" type="tel" inputMode="tel" register={register} errors={errors} />
          <TextField name="identity.email" label="E-mail" type="email" inputMode="email" register={register} errors={errors} />
          <TextField
            name="identity.taxNumber"
            label="Tax number"
            hint="The shop's sales-tax or VAT registration, printed on receipts and invoices. Leave blank if the shop has none."
            register={register}
            errors={errors}
          />
          <TextField
            name="identity.timeZone"
            label="Time zone"
            hint="Where the shop is, as a region name (America/New_York, Europe/London). Every date and time in pages, e-mails and certificates is shown in it."
            list="time-zone-choices"
            register={register}
            errors={errors}
          />
          <datalist id="time-zone-choices">
            {timeZones.map((z) => (
              <option key={z} value={z} />
            ))}
          </datalist>
        </div>
      </Section>

      <Section
        id="s-labour"
        title="Labour and billing"
        intro={`Amounts in ${currency}, typed as on a price tag (90.00). Labour minutes are rounded up to the billing increment, once per job unless you choose each line.`}
      >
        <div className="grid gap-4 md:grid-cols-2">
          <TextField
            name="labourRate"
            label="Labour rate"
            prefix={currency}
            suffix="per hour"
            inputMode="decimal"
            register={register}
            errors={errors}
          />
          <TextField
            name="billingIncrementMinutes"
            label="Billing increment"
            suffix="minutes"
            type="number"
            number
            register={register}
            errors={errors}
            hint="15 bills 449 minutes of work as 450 when rounded once per job."
          />
        </div>
        <fieldset className="space-y-2" aria-describedby="billing-rounding-hint">
          <legend className="field-label">Rounding to the increment</legend>
          <div className="flex items-start gap-2">
            <input id="f-billing-rounding-job" type="radio" value="job" className="mt-1 h-4 w-4" {...register("billingRounding")} />
            <label htmlFor="f-billing-rounding-job" className="text-sm">
              <span className="font-semibold">Once, on the job&apos;s labour total</span> — the usual choice: the owner pays for the time
              listed, rounded up once.
            </label>
          </div>
          <div className="flex items-start gap-2">
            <input id="f-billing-rounding-line" type="radio" value="line" className="mt-1 h-4 w-4" {...register("billingRounding")} />
            <label htmlFor="f-billing-rounding-line" className="text-sm">
              <span className="font-semibold">On each line</span> — every line is rounded up on its own, which bills more on a long
              checklist.
            </label>
          </div>
          <p id="billing-rounding-hint" className="text-xs text-bakelite-muted">
            The owner&apos;s estimate says once how the minutes were rounded (“billed as N minutes”).
          </p>
          {errorAt(errors, "billingRounding") ? (
            <p className="text-sm text-fail" role="alert">
              {errorAt(errors, "billingRounding")}
            </p>
          ) : null}
        </fieldset>
      </Section>

      <Section
        id="s-minutes"
        title="Minutes per checklist rule"
        intro="Standard minutes for each line the checklist computes from a set's profile. Rules marked “per …” are multiplied by the count."
      >
        <div className="grid gap-6 lg:grid-cols-2">
          {rulesByCategory.map(({ cat, rules }) => (
            <table key={cat} className="dense-table h-fit self-start">
              <caption className="mb-1 text-left font-semibold">{CATEGORY_LABEL[cat]}</caption>
              <thead>
                <tr>
                  <th scope="col">Rule</th>
                  <th scope="col" className="text-right">
                    Minutes
                  </th>
                </tr>
              </thead>
              <tbody>
                {rules.map((r) => (
                  <tr key={r.code}>
                    <th scope="row" className="bg-transparent font-normal">
                      {RULE_LABEL[r.code].title}
                      {RULE_LABEL[r.code].per ? <span className="text-bakelite-muted"> ({RULE_LABEL[r.code].per})</span> : null}
                    </th>
                    <td className="text-right">
                      <CellInput
                        name={`minutesPerRule.${r.i}.minutes`}
                        label={`Minutes for ${RULE_LABEL[r.code].title}`}
                        register={register}
                        errors={errors}
                        step="1"
                      />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          ))}
        </div>
        {errorAt(errors, "minutesPerRule") ? (
          <p className="field-error" role="alert">
            {errorAt(errors, "minutesPerRule")}
          </p>
        ) : null}
      </Section>

      <Section
        id="s-parts"
        title="Parts and markup"
        intro="The markup on a part that has none of its own. Costs and markups are never shown to set owners."
      >
        <TextField
          name="parts.defaultMarkupPercent"
          label="Default markup"
          suffix="%"
          inputMode="decimal"
          register={register}
          errors={errors}
          className="max-w-xs"
        />
        <p className="text-sm">
          <a href="/office/parts" className="underline">
            The parts catalogue
          </a>{" "}
          keeps each part&apos;s name, cost and any markup of its own.
        </p>
      </Section>

      <Section
        id="s-tax"
        title="Tax and deposit"
        intro="Tax rates are percentages with up to two decimals (8.25). The deposit is a share of the total, raised to the parts cost and to the processor's minimum charge if needed, and never above the total."
      >
        <div className="grid gap-4 md:grid-cols-3">
          <TextField name="tax.labourPercent" label="Tax on labour" suffix="%" inputMode="decimal" register={register} errors={errors} />
          <TextField name="tax.partsPercent" label="Tax on parts" suffix="%" inputMode="decimal" register={register} errors={errors} />
          <div />
          <TextField
            name="deposit.percent"
            label="Deposit"
            suffix="% of the total"
            inputMode="decimal"
            register={register}
            errors={errors}
          />
          <TextField
            name="deposit.processorMinimum"
            label="Processor's minimum charge"
            prefix={currency}
            inputMode="decimal"
            register={register}
            errors={errors}
          />
          <div className="flex items-start gap-2 pt-7">
            <input id="f-deposit-atLeastParts" type="checkbox" className="mt-1 h-4 w-4" {...register("deposit.atLeastParts")} />
            <label htmlFor="f-deposit-atLeastParts" className="text-sm">
              Deposit covers at least the cost of the parts
            </label>
          </div>
        </div>
      </Section>

      <Section
        id="s-warranty"
        title="Warranty"
        intro="The term starts on the day the set is returned. These words are printed on every certificate; they are the shop's own and should follow local law."
      >
        <div className="grid gap-4 md:grid-cols-2">
          <TextField
            name="warranty.termDays"
            label="Warranty term"
            suffix="days"
            type="number"
            number
            register={register}
            errors={errors}
          />
        </div>
        <fieldset className="space-y-2">
          <legend className="field-label">Designation</legend>
          <div className="flex items-start gap-2">
            <input id="f-designation-limited" type="radio" value="limited" className="mt-1 h-4 w-4" {...register("warranty.designation")} />
            <label htmlFor="f-designation-limited" className="text-sm">
              <span className="font-semibold">Limited warranty</span> — the usual choice: the shop sets who is covered and what it will do.
            </label>
          </div>
          <div className="flex items-start gap-2">
            <input id="f-designation-full" type="radio" value="full" className="mt-1 h-4 w-4" {...register("warranty.designation")} />
            <label htmlFor="f-designation-full" className="text-sm">
              <span className="font-semibold">Full warranty</span> — only if the terms meet the legal minimum standards for that word.
            </label>
          </div>
        </fieldset>
        {designation === "full" ? (
          <Notice tone="caution" title="Calling it a full warranty is a promise">
            <p>
              Where a written warranty may be called “full” only when it meets minimum standards (in the United States, 15 U.S.C. §2304),
              the terms must at least:
            </p>
            <ul className="list-disc pl-5">
              <li>cover everyone who owns the set during the term, not only the first owner;</li>
              <li>put a covered fault right free of charge, within a reasonable time;</li>
              <li>let the owner choose a refund or replacement if the shop cannot fix it after a reasonable number of tries;</li>
              <li>not limit how long implied warranties last, and not ask the owner to do anything unreasonable to get service.</li>
            </ul>
            <p>Check the wording below against those standards and your local law. If in doubt, keep “Limited warranty”.</p>
            <div className="flex items-start gap-2 pt-1">
              <input
                id="f-warranty-fullAcknowledged"
                type="checkbox"
                className="mt-1 h-4 w-4"
                aria-invalid={!!errorAt(errors, "warranty.fullAcknowledged")}
                aria-describedby={errorAt(errors, "warranty.fullAcknowledged") ? "f-warranty-fullAcknowledged-error" : undefined}
                {...register("warranty.fullAcknowledged")}
              />
              <label htmlFor="f-warranty-fullAcknowledged" className="font-semibold">
                I have checked that these terms meet the minimum standards for a full warranty
              </label>
            </div>
            {errorAt(errors, "warranty.fullAcknowledged") ? (
              <p id="f-warranty-fullAcknowledged-error" className="field-error" role="alert">
                {errorAt(errors, "warranty.fullAcknowledged")}
              </p>
            ) : null}
          </Notice>
        ) : null}

        <div className="grid gap-6 lg:grid-cols-2">
          <fieldset className="space-y-2" aria-describedby={errorAt(errors, "warranty.coveredKeys") ? "f-covered-error" : undefined}>
            <legend className="field-label">What is covered</legend>
            {coveredWordingKeys.map((k) => (
              <div key={k} className="flex items-start gap-2">
                <input id={`f-covered-${k}`} type="checkbox" value={k} className="mt-1 h-4 w-4" {...register("warranty.coveredKeys")} />
                <label htmlFor={`f-covered-${k}`} className="text-sm">
                  {coveredWording[k]}
                </label>
              </div>
            ))}
            {errorAt(errors, "warranty.coveredKeys") ? (
              <p id="f-covered-error" className="field-error" role="alert">
                {errorAt(errors, "warranty.coveredKeys")}
              </p>
            ) : null}
          </fieldset>
          <fieldset className="space-y-2">
            <legend className="field-label">What is excluded</legend>
            {exclusionCodes.map((k) => (
              <div key={k} className="flex items-start gap-2">
                <input id={`f-excluded-${k}`} type="checkbox" value={k} className="mt-1 h-4 w-4" {...register("warranty.excludedKeys")} />
                <label htmlFor={`f-excluded-${k}`} className="text-sm">
                  {exclusionWording[k]}
                </label>
              </div>
            ))}
          </fieldset>
        </div>

        <div className="space-y-1">
          <div className="flex items-start gap-2">
            <input
              id="f-warrantyTerms-transferable"
              type="checkbox"
              className="mt-1 h-4 w-4"
              aria-invalid={!!errorAt(errors, "warrantyTerms.transferable")}
              aria-describedby={errorAt(errors, "warrantyTerms.transferable") ? "f-warrantyTerms-transferable-error" : undefined}
              {...register("warrantyTerms.transferable")}
            />
            <label htmlFor="f-warrantyTerms-transferable" className="text-sm font-semibold">
              Coverage passes to a later owner of the set for the rest of the term
            </label>
          </div>
          {errorAt(errors, "warrantyTerms.transferable") ? (
            <p id="f-warrantyTerms-transferable-error" className="field-error" role="alert">
              {errorAt(errors, "warrantyTerms.transferable")}
            </p>
          ) : null}
        </div>
        <div className="grid gap-4 lg:grid-cols-2">
          <TextArea name="warrantyTerms.whoIsCovered" label="Who is covered" register={register} errors={errors} />
          <TextArea name="warrantyTerms.whatWeWillDo" label="What the shop will do" register={register} errors={errors} />
          <TextArea name="warrantyTerms.whatWeWillNotDo" label="What the shop will not do or pay for" register={register} errors={errors} />
          <TextArea name="warrantyTerms.disputes" label="If the owner disagrees with a decision" register={register} errors={errors} />
          <TextArea name="warrantyTerms.impliedWarranties" label="Implied warranties" register={register} errors={errors} />
          <TextArea
            name="warrantyTerms.consequentialDamages"
            label="Incidental and consequential damages"
            register={register}
            errors={errors}
          />
        </div>
        <fieldset className="space-y-2">
          <legend className="field-label">How to make a claim (printed as numbered steps)</legend>
          <ol className="space-y-2">
            {(steps ?? []).map((_, i) => {
              const id = `f-warrantyTerms-howToClaim-${i}`;
              const error = errorAt(errors, `warrantyTerms.howToClaim.${i}`);
              return (
                <li key={i} className="flex items-start gap-2">
                  <label htmlFor={id} className="figure mt-2 w-14 shrink-0 text-sm">
                    Step {i + 1}
                  </label>
                  <div className="flex-1">
                    <textarea
                      id={id}
                      rows={2}
                      className="field-input mt-0"
                      aria-invalid={!!error}
                      aria-describedby={error ? `${id}-error` : undefined}
                      {...register(`warrantyTerms.howToClaim.${i}`)}
                    />
                    {error ? (
                      <p id={`${id}-error`} className="field-error" role="alert">
                        {error}
                      </p>
                    ) : null}
                  </div>
                  <button type="button" className="btn-quiet px-2 py-1" onClick={() => removeStep(i)} disabled={(steps ?? []).length <= 1}>
                    Remove step {i + 1}
                  </button>
                </li>
              );
            })}
          </ol>
          <button type="button" className="btn-secondary px-3 py-1" onClick={addStep} disabled={(steps ?? []).length >= 10}>
            Add a step
          </button>
          {errorAt(errors, "warrantyTerms.howToClaim") ? (
            <p className="field-error" role="alert">
              {errorAt(errors, "warrantyTerms.howToClaim")}
            </p>
          ) : null}
        </fieldset>
        <TextArea name="warrantyTerms.shopWording" label="Anything else to print (optional)" register={register} errors={errors} rows={3} />
      </Section>

      <Section
        id="s-tolerances"
        title="Tolerances"
        intro="A reading passes when it is within the larger of the two figures: an absolute window in kHz or a percentage of the mark. Dial calibration is one figure in received frequency: an LO reading at a mark gets the same window, around mark + IF. The certificate prints the tolerance applied and which reading it came from."
      >
        <div className="overflow-x-auto">
          <table className="dense-table">
            <thead>
              <tr>
                <th scope="col">Band kind</th>
                <th scope="col">Dial calibration ± kHz</th>
                <th scope="col">Dial calibration ± %</th>
                <th scope="col">IF peak ± kHz</th>
                <th scope="col">IF peak ± %</th>
              </tr>
            </thead>
            <tbody>
              {bandKinds.map((k) => (
                <tr key={k}>
                  <th scope="row" className="bg-transparent font-normal">
                    {BAND_KIND_LABEL[k]} ({k})
                  </th>
                  {(["dial", "ifPeak"] as const).flatMap((what) =>
                    (["absKHz", "percent"] as const).map((unit) => (
                      <td key={`${what}-${unit}`}>
                        <CellInput
                          name={`tolerances.byBandKind.${k}.${what}.${unit}`}
                          label={`${BAND_KIND_LABEL[k]}: ${what === "dial" ? "dial calibration" : "IF peak"} tolerance in ${unit === "absKHz" ? "kHz" : "percent"}`}
                          register={register}
                          errors={errors}
                        />
                      </td>
                    )),
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <div className="grid gap-4 md:grid-cols-3">
          <TextField
            name="tolerances.leakageLimitMA.v120"
            label="Leakage limit, 120 V two-wire sets"
            suffix="mA"
            type="number"
            number
            register={register}
            errors={errors}
          />
          <TextField
            name="tolerances.leakageLimitMA.v230"
            label="Leakage limit, 230 V two-wire sets"
            suffix="mA"
            type="number"
            number
            register={register}
            errors={errors}
          />
          <TextField
            name="tolerances.bPlusPercent"
            label="B+ against the schematic figure"
            suffix="± %"
            type="number"
            number
            register={register}
            errors={errors}
          />
        </div>
        <Notice tone="caution" title="Leakage limits protect people">
          <p>
            The leakage limit is a safety figure: keep it at or below what local codes and licensed practice require for the supply voltage.
            A limit may be made stricter, never looser than the published figure: {leakageCeilings.v120.limitMA} mA at 120 V (
            {leakageCeilings.v120.source}) and {leakageCeilings.v230.limitMA} mA rms at 230 V ({leakageCeilings.v230.source}).
          </p>
        </Notice>
      </Section>

      <div className="sticky bottom-0 z-10 -mx-4 border-t border-dial-rule bg-dial/95 px-4 py-3 backdrop-blur">
        <div className="flex flex-wrap items-center gap-3">
          <button type="submit" className="btn-primary" disabled={save.isPending}>
            {save.isPending ? "Saving…" : "Save settings"}
          </button>
          <button
            type="button"
            className="btn-quiet"
            disabled={!formState.isDirty || save.isPending}
            onClick={() => reset(snapshot.values)}
          >
            Undo my changes
          </button>
          <span className="text-sm text-bakelite-soft">{formState.isDirty ? "You have unsaved changes." : "No unsaved changes."}</span>
        </div>
        <div className="mt-2 space-y-2">
          {saved ? (
            <Notice tone="success" live>
              <p>{saved}</p>
            </Notice>
          ) : null}
          {problem ? (
            <Notice tone="error" title={problem.kind === "stale" ? "Someone else saved first" : "Not saved"} live>
              <p>{problem.message}</p>
              {problem.kind === "stale" ? (
                <div className="flex flex-wrap gap-2 pt-1">
                  <button type="button" className="btn-secondary px-3 py-1" onClick={keepMine}>
                    Save my version over theirs
                  </button>
                  <button type="button" className="btn-secondary px-3 py-1" onClick={loadTheirs}>
                    Show their version (drop my changes)
                  </button>
                </div>
              ) : null}
            </Notice>
          ) : null}
        </div>
      </div>
    </form>
  );
}
