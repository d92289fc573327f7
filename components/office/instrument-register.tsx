"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { TableScroll } from "@/components/ui/table-scroll";
import type { InstrumentView } from "@/lib/server/services/instruments";
import { INSTRUMENT_KIND_LABEL, INSTRUMENT_KINDS } from "@/lib/engine/instruments";
import { instrumentCreateSchema, type InstrumentCreateInput } from "@/lib/validation/instruments";
import { ApiError, officeFetch } from "@/lib/client/office-api";
import { officeKeys } from "@/lib/client/office-query-keys";

type Outcome = { tone: "success" | "error"; text: string } | null;

const errorText = (e: unknown) => (e instanceof Error ? e.message : "Something went wrong. Please try again.");
const nameOf = (i: Pick<InstrumentView, "maker" | "model" | "serial">) => `${i.maker} ${i.model} (${i.serial})`;

const FIELDS = ["kind", "maker", "model", "serial", "calibratedOn", "calibrationDueOn"] as const;

function AddInstrumentForm({ onAdded }: { onAdded: (i: InstrumentView) => void }) {
  const { register, handleSubmit, formState, setError, reset } = useForm<InstrumentCreateInput>({
    resolver: zodResolver(instrumentCreateSchema),
    defaultValues: { kind: "signal_generator", maker: "", model: "", serial: "", calibratedOn: "", calibrationDueOn: "" },
  });
  const { errors } = formState;
  const [problem, setProblem] = useState<string | null>(null);
  const add = useMutation({
    mutationFn: (values: InstrumentCreateInput) =>
      officeFetch<{ instrument: InstrumentView }>("/api/office/instruments", { method: "POST", json: values }),
    onSuccess: ({ instrument }) => {
      setProblem(null);
      reset({ kind: instrument.kind, maker: "", model: "", serial: "", calibratedOn: "", calibrationDueOn: "" });
      onAdded(instrument);
    },
    onError: (e) => {
      if (e instanceof ApiError && e.fields)
        for (const [field, message] of Object.entries(e.fields))
          if ((FIELDS as readonly string[]).includes(field)) setError(field as (typeof FIELDS)[number], { type: "server", message });
      setProblem(errorText(e));
    },
  });
  const text = (name: Exclude<(typeof FIELDS)[number], "kind">, label: string, hint: string, type = "text") => (
    <Field id={`instrument-${name}`} label={label} hint={hint} error={errors[name]?.message}>
      <input
        id={`instrument-${name}`}
        type={type}
        className="field-input"
        autoComplete="off"
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={describedBy(`instrument-${name}`, { error: errors[name], hint })}
        {...register(name)}
      />
    </Field>
  );
  return (
    <form noValidate onSubmit={handleSubmit((v) => add.mutate(v))} className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
      <Field id="instrument-kind" label="Kind" error={errors.kind?.message}>
        <select id="instrument-kind" className="field-input" {...register("kind")}>
          {INSTRUMENT_KINDS.map((k) => (
            <option key={k} value={k}>
              {INSTRUMENT_KIND_LABEL[k]}
            </option>
          ))}
        </select>
      </Field>
      {text("maker", "Maker", "As the shop writes it, e.g. Port Alder Instruments.")}
      {text("model", "Model", "As on the front panel.")}
      {text("serial", "Serial", "From the rating plate.")}
      {text("calibratedOn", "Last calibration", "The date on the calibration label.", "date")}
      {text("calibrationDueOn", "Calibration due", "Readings after this date are flagged.", "date")}
      <div className="sm:col-span-2 lg:col-span-3">
        <button type="submit" className="btn-primary" disabled={add.isPending}>
          {add.isPending ? "Adding…" : "Add instrument"}
        </button>
        {problem ? (
          <p className="field-error" role="alert">
            {problem}
          </p>
        ) : null}
      </div>
    </form>
  );
}

function CalibrationForm({
  instrument,
  onDone,
}: {
  instrument: InstrumentView;
  onDone: (i: InstrumentView | null, error?: string) => void;
}) {
  const [calibratedOn, setCalibratedOn] = useState("");
  const [calibrationDueOn, setDue] = useState("");
  const [error, setError] = useState<string | null>(null);
  const save = useMutation({
    mutationFn: () =>
      officeFetch<{ instrument: InstrumentView }>(`/api/office/instruments/${instrument.id}`, {
        method: "PATCH",
        json: { calibratedOn, calibrationDueOn },
      }),
    onSuccess: ({ instrument: i }) => onDone(i),
    onError: (e) => setError(e instanceof ApiError && e.fields ? (Object.values(e.fields)[0] ?? e.message) : errorText(e)),
  });
  const id = `cal-${instrument.id}`;
  return (
    <form
      noValidate
      className="mt-1 flex flex-wrap items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate();
      }}
    >
      <Field id={`${id}-on`} label="Calibrated">
        <input
          id={`${id}-on`}
          type="date"
          className="field-input py-0.5"
          value={calibratedOn}
          onChange={(e) => setCalibratedOn(e.target.value)}
        />
      </Field>
      <Field id={`${id}-due`} label="Due">
        <input
          id={`${id}-due`}
          type="date"
          className="field-input py-0.5"
          value={calibrationDueOn}
          onChange={(e) => setDue(e.target.value)}
        />
      </Field>
      <button type="submit" className="btn-secondary py-1" disabled={save.isPending}>
        Save calibration<span className="sr-only"> of {nameOf(instrument)}</span>
      </button>
      <button type="button" className="btn-quiet py-1" onClick={() => onDone(null)}>
        Cancel
      </button>
      {error ? (
        <p className="field-error w-full" role="alert">
          {error}
        </p>
      ) : null}
    </form>
  );
}

export function InstrumentRegister({ initial }: { initial: InstrumentView[] }) {
  const qc = useQueryClient();
  const key = officeKeys.instruments();
  const { data: instruments = initial } = useQuery({
    queryKey: key,
    queryFn: async () => (await officeFetch<{ instruments: InstrumentView[] }>("/api/office/instruments")).instruments,
    initialData: initial,
  });
  const [outcome, setOutcome] = useState<Outcome>(null);
  const [calibrating, setCalibrating] = useState<string | null>(null);
  const refresh = () => void qc.invalidateQueries({ queryKey: key });

  const change = useMutation({
    mutationFn: ({ id, retired }: { id: string; retired: boolean }) =>
      officeFetch<{ instrument: InstrumentView }>(`/api/office/instruments/${id}`, { method: "PATCH", json: { retired } }),
    onSuccess: ({ instrument }) => {
      setOutcome({
        tone: "success",
        text: instrument.retiredAt
          ? `${nameOf(instrument)} retired: kept for its readings' history, no longer offered at the bench.`
          : `${nameOf(instrument)} is back in service.`,
      });
      refresh();
    },
    onError: (e) => setOutcome({ tone: "error", text: errorText(e) }),
  });
  const remove = useMutation({
    mutationFn: (i: InstrumentView) => officeFetch<{ id: string }>(`/api/office/instruments/${i.id}`, { method: "DELETE" }),
    onSuccess: (_r, i) => {
      setOutcome({ tone: "success", text: `${nameOf(i)} removed from the register.` });
      refresh();
    },
    onError: (e) => setOutcome({ tone: "error", text: errorText(e) }),
  });

  return (
    <div className="space-y-6">
      <section aria-labelledby="register-heading" className="card p-4">
        <h2 id="register-heading" className="mb-2 text-lg font-semibold">
          Register
        </h2>
        {outcome ? (
          <Notice tone={outcome.tone} live>
            {outcome.text}
          </Notice>
        ) : null}
        {instruments.length === 0 ? <p className="text-sm text-bakelite-muted">No instruments yet: add the first one below.</p> : null}
        <TableScroll label="Instruments">
          <table className="dense-table w-full">
            <thead>
              <tr>
                <th scope="col">Instrument</th>
                <th scope="col">Kind</th>
                <th scope="col">Calibration</th>
                <th scope="col">Status</th>
                <th scope="col">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {instruments.map((i) => (
                <tr key={i.id} data-instrument={i.id} data-retired={i.retiredAt ? "yes" : "no"}>
                  <th scope="row" className="text-left font-normal">
                    <span className="font-semibold">
                      {i.maker} {i.model}
                    </span>
                    <span className="block figure text-xs text-bakelite-muted">Serial {i.serial}</span>
                  </th>
                  <td>{i.kindLabel}</td>
                  <td className="whitespace-nowrap">
                    <span className="block figure text-xs">Calibrated {i.calibratedOn}</span>
                    <span
                      className={`block figure text-xs ${i.overdue ? "font-semibold text-fail" : ""}`}
                      data-due={i.overdue ? "overdue" : "ok"}
                    >
                      {i.overdue ? <span aria-hidden="true">⚠ </span> : null}Due {i.calibrationDueOn}
                      {i.overdue ? " — overdue" : ""}
                    </span>
                    {calibrating === i.id ? (
                      <CalibrationForm
                        instrument={i}
                        onDone={(updated) => {
                          setCalibrating(null);
                          if (updated) {
                            setOutcome({
                              tone: "success",
                              text: `New calibration of ${nameOf(updated)} recorded: due ${updated.calibrationDueOn}.`,
                            });
                            refresh();
                          }
                        }}
                      />
                    ) : null}
                  </td>
                  <td className="text-sm">
                    {i.retiredAt ? "Retired" : "In service"}
                    <span className="block text-xs text-bakelite-muted">
                      {i.readingsTaken} reading{i.readingsTaken === 1 ? "" : "s"} taken
                    </span>
                  </td>
                  <td>
                    <div className="flex flex-wrap gap-1">
                      {!i.retiredAt && calibrating !== i.id ? (
                        <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => setCalibrating(i.id)}>
                          New calibration<span className="sr-only"> of {nameOf(i)}</span>
                        </button>
                      ) : null}
                      <button
                        type="button"
                        className="btn-quiet px-2 py-0.5 text-xs"
                        disabled={change.isPending}
                        onClick={() => change.mutate({ id: i.id, retired: !i.retiredAt })}
                      >
                        {i.retiredAt ? "Return to service" : "Retire"}
                        <span className="sr-only"> {nameOf(i)}</span>
                      </button>
                      {i.readingsTaken === 0 ? (
                        <button
                          type="button"
                          className="btn-quiet px-2 py-0.5 text-xs"
                          disabled={remove.isPending}
                          onClick={() => {
                            if (window.confirm(`Remove ${nameOf(i)} from the register? No reading names it.`)) remove.mutate(i);
                          }}
                        >
                          Remove<span className="sr-only"> {nameOf(i)}</span>
                        </button>
                      ) : null}
                    </div>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableScroll>
      </section>
      <section aria-labelledby="add-heading" className="card p-4">
        <h2 id="add-heading" className="mb-3 text-lg font-semibold">
          Add an instrument
        </h2>
        <AddInstrumentForm
          onAdded={(i) => {
            setOutcome({ tone: "success", text: `${nameOf(i)} added to the register.` });
            refresh();
          }}
        />
      </section>
    </div>
  );
}
