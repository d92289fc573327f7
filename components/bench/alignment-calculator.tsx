"use client";

import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { useForm, type FieldPath } from "react-hook-form";
import { Notice } from "@/components/ui/notice";
import { bandKinds, type Band } from "@/lib/engine/bands/band";
import { alignmentRequestSchema, fieldErrors, type AlignmentRequest, type AlignmentResponse } from "@/lib/engine/requests";
import { formatNumber } from "@/lib/engine/verdicts";
import { api, ApiError, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { TrackingPlot } from "./tracking-plot";

type CalcForm = {
  band: { kind: string; lowKHz: string; highKHz: string };
  ifKHz: string;
  injection: string;
  gang: { minPF: string; maxPF: string; strayPF: string };
  trackingPointsKHz: [string, string, string];
};

const num = (s: string): number | undefined => {
  const t = s.trim().replace(/,/g, "");
  return t === "" ? undefined : Number(t);
};

function toRequest(v: CalcForm): unknown {
  const tp = v.trackingPointsKHz.map(num);
  const gangGiven = v.gang.minPF.trim() !== "" || v.gang.maxPF.trim() !== "";
  return {
    band: { lowKHz: num(v.band.lowKHz), highKHz: num(v.band.highKHz), ...(v.band.kind ? { kind: v.band.kind } : {}) },
    ifKHz: num(v.ifKHz),
    ...(v.injection ? { injection: v.injection } : {}),
    ...(gangGiven
      ? { gang: { minPF: num(v.gang.minPF), maxPF: num(v.gang.maxPF), ...(v.gang.strayPF.trim() ? { strayPF: num(v.gang.strayPF) } : {}) } }
      : {}),
    ...(tp.some((x) => x !== undefined) ? { trackingPointsKHz: tp } : {}),
  };
}

function formFromBand(b: Band | null): CalcForm {
  return {
    band: { kind: b?.kind ?? "MW", lowKHz: String(b?.lowKHz ?? 540), highKHz: String(b?.highKHz ?? 1600) },
    ifKHz: String(b?.ifKHz ?? 455),
    injection: b?.injection === "low" ? "low" : "",
    gang: { minPF: b && b.kind !== "MW" ? "" : "10", maxPF: b && b.kind !== "MW" ? "" : "365", strayPF: "" },
    trackingPointsKHz: ["", "", ""],
  };
}

const f2 = (x: number) => formatNumber(x, 2);
const freq = (kHz: number) => (kHz >= 10000 ? `${formatNumber(kHz / 1000, 3)} MHz` : `${formatNumber(kHz, 2)} kHz`);

function Figure({ name, label, value, unit }: { name: string; label: string; value: number; unit: string }) {
  return (
    <div>
      <dt className="text-xs text-bakelite-muted">{label}</dt>
      <dd className="figure font-semibold">
        <span data-figure={name}>{f2(value)}</span> {unit}
      </dd>
    </div>
  );
}

function Result({ r }: { r: AlignmentResponse }) {
  const d = r.design;
  const unit = r.bandKind === "FM" ? "MHz" : "kHz";
  return (
    <div className="space-y-3" data-testid="alignment-result">
      <dl className="card grid grid-cols-2 gap-x-4 gap-y-1 p-3 text-sm md:grid-cols-4">
        <div>
          <dt className="text-xs text-bakelite-muted">LO range ({r.injection === "high" ? "above" : "below"} the signal)</dt>
          <dd className="figure font-semibold">
            <span data-figure="lo.lowKHz">{f2(r.lo.lowKHz)}</span>–<span data-figure="lo.highKHz">{f2(r.lo.highKHz)}</span> kHz
          </dd>
        </div>
        <div>
          <dt className="text-xs text-bakelite-muted">Image frequencies</dt>
          <dd className="figure font-semibold">
            <span data-figure="image.lowKHz">{f2(r.image.lowKHz)}</span>–<span data-figure="image.highKHz">{f2(r.image.highKHz)}</span> kHz
          </dd>
        </div>
        <Figure name="capacitanceRatio.signal" label="Capacitance ratio, signal" value={r.capacitanceRatio.signal} unit="×" />
        <Figure name="capacitanceRatio.oscillator" label="Capacitance ratio, oscillator" value={r.capacitanceRatio.oscillator} unit="×" />
        <div className="col-span-2">
          <dt className="text-xs text-bakelite-muted">Tracking points</dt>
          <dd className="figure font-semibold">
            {r.trackingPointsKHz.map((p, i) => (
              <span key={i} className="mr-3">
                <span data-figure={`trackingPointsKHz.${i}`}>{f2(p)}</span> kHz
              </span>
            ))}
          </dd>
        </div>
        {r.imageRejection ? (
          <div className="col-span-2">
            <dt className="text-xs text-bakelite-muted">Image rejection (one tuned circuit)</dt>
            <dd className="figure">
              {f2(r.imageRejection.atLowEnd.dB)} dB at the low end, {f2(r.imageRejection.atHighEnd.dB)} dB at the high end
            </dd>
          </div>
        ) : null}
      </dl>
      {r.warnings.length ? (
        <Notice tone="caution" title="Check">
          <ul className="list-disc pl-5">
            {r.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </Notice>
      ) : null}
      <section className="card p-3" aria-labelledby="steps-heading">
        <h4 id="steps-heading" className="font-semibold">
          Order of adjustments
        </h4>
        <ol className="list-decimal space-y-0.5 pl-5 text-sm">
          {r.steps.map((s) => (
            <li key={s.order}>{s.text}</li>
          ))}
        </ol>
      </section>
      {d ? (
        <section className="card space-y-2 p-3" aria-labelledby="design-heading">
          <h4 id="design-heading" className="font-semibold">
            Three-point tracking design
          </h4>
          <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm md:grid-cols-4">
            <Figure name="design.signalInductanceUH" label="Signal inductance" value={d.signalInductanceUH} unit="µH" />
            <Figure name="design.signalFixedPF" label="Signal fixed capacitance" value={d.signalFixedPF} unit="pF" />
            <Figure name="design.signalTrimmerPF" label="Signal trimmer" value={d.signalTrimmerPF} unit="pF" />
            <Figure name="design.padderPF" label="Padder" value={d.padderPF} unit="pF" />
            <Figure name="design.oscillatorFixedPF" label="Oscillator fixed capacitance" value={d.oscillatorFixedPF} unit="pF" />
            <Figure name="design.oscillatorTrimmerPF" label="Oscillator trimmer" value={d.oscillatorTrimmerPF} unit="pF" />
            <Figure name="design.oscillatorInductanceUH" label="Oscillator inductance" value={d.oscillatorInductanceUH} unit="µH" />
            <Figure name="design.maxAbsErrorKHz" label="Largest tracking error" value={d.maxAbsErrorKHz} unit="kHz" />
          </dl>
          <TrackingPlot
            curve={d.errorCurve}
            trackingPointsKHz={r.trackingPointsKHz}
            minimaxCurve={d.minimax?.errorCurve ?? null}
            unit={unit}
          />
          {d.minimax ? (
            <p className="text-sm">
              Equal-ripple points: <span className="figure">{d.minimax.trackingPointsKHz.map((p) => freq(p)).join(", ")}</span>, largest
              error <span className="figure">{f2(d.minimax.maxAbsErrorKHz)} kHz</span>.
            </p>
          ) : null}
          <table className="dense-table">
            <caption className="text-left text-xs text-bakelite-muted">Two-point designs, for comparison</caption>
            <thead>
              <tr>
                <th scope="col">Method</th>
                <th scope="col">Padder, pF</th>
                <th scope="col">Oscillator fixed, pF</th>
                <th scope="col">Oscillator L, µH</th>
                <th scope="col">Largest error, kHz</th>
              </tr>
            </thead>
            <tbody>
              {d.comparisons.map((c) => (
                <tr key={c.method}>
                  <td>{c.method === "padder-only" ? "Padder only" : "Trimmer only"}</td>
                  {c.ok ? (
                    <>
                      <td className="figure">{c.padderPF === null ? "—" : f2(c.padderPF)}</td>
                      <td className="figure">{f2(c.oscillatorFixedPF)}</td>
                      <td className="figure">{f2(c.oscillatorInductanceUH)}</td>
                      <td className="figure">{f2(c.maxAbsErrorKHz)}</td>
                    </>
                  ) : (
                    <td colSpan={4}>{c.reason}</td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : (
        <p className="text-sm text-bakelite-muted">
          Give the gang capacitance (minimum and maximum) to solve the tracking design and plot the error.
        </p>
      )}
    </div>
  );
}

export function AlignmentCalculator({ bands = [] }: { bands?: Band[] }) {
  const [request, setRequest] = useState<AlignmentRequest | null>(null);
  const [bandIndex, setBandIndex] = useState(0);
  const form = useForm<CalcForm>({ defaultValues: formFromBand(bands[0] ?? null) });
  const { register, handleSubmit, formState, setError, clearErrors, reset } = form;
  const q = useQuery({
    queryKey: benchKeys.alignment(request),
    queryFn: () => api<AlignmentResponse>("/api/tools/alignment", { method: "POST", body: request }),
    enabled: request !== null,
    retry: false,
    staleTime: Infinity,
  });
  const apiFields = q.error instanceof ApiError ? q.error.fields : {};

  const submit = handleSubmit((v) => {
    clearErrors();
    const parsed = alignmentRequestSchema.safeParse(toRequest(v));
    if (!parsed.success) {
      for (const [k, m] of Object.entries(fieldErrors(parsed.error)))
        setError((k === "_" ? "root" : k) as FieldPath<CalcForm>, { message: m });
      return;
    }
    setRequest(parsed.data);
  });

  const errAt = (path: string): string | undefined => {
    let e: unknown = formState.errors;
    for (const part of path.split(".")) e = (e as Record<string, unknown> | undefined)?.[part];
    return (e as { message?: string } | undefined)?.message ?? apiFields[path];
  };
  const input = (path: FieldPath<CalcForm>, label: string, unit: string, hint?: string) => {
    const id = `calc-${path.replaceAll(".", "-")}`;
    const message = errAt(path);
    return (
      <div>
        <label htmlFor={id} className="field-label text-xs">
          {label}
        </label>
        <div className="flex items-center gap-1">
          <input
            id={id}
            inputMode="decimal"
            className="field-input figure mt-0 w-28 py-1 text-right"
            aria-invalid={message ? true : undefined}
            aria-describedby={message ? `${id}-error` : hint ? `${id}-hint` : undefined}
            {...register(path)}
          />
          <span className="text-xs">{unit}</span>
        </div>
        {hint ? (
          <p id={`${id}-hint`} className="text-xs text-bakelite-muted">
            {hint}
          </p>
        ) : null}
        {message ? (
          <p id={`${id}-error`} className="field-error text-xs">
            {message}
          </p>
        ) : null}
      </div>
    );
  };

  return (
    <div className="space-y-3">
      <form noValidate onSubmit={submit} className="card space-y-3 p-3" aria-label="Alignment calculator">
        {bands.length ? (
          <div>
            <label htmlFor="calc-preset" className="field-label text-xs">
              Band from the set profile
            </label>
            <select
              id="calc-preset"
              className="field-input mt-0 w-auto py-1"
              value={bandIndex}
              onChange={(e) => {
                const i = Number(e.target.value);
                setBandIndex(i);
                reset(formFromBand(bands[i] ?? null));
                setRequest(null);
              }}
            >
              {bands.map((b, i) => (
                <option key={i} value={i}>
                  {b.label || `Band ${i + 1}`}: {b.kind} {freq(b.lowKHz)}–{freq(b.highKHz)}, IF {freq(b.ifKHz)}
                </option>
              ))}
            </select>
          </div>
        ) : null}
        <div className="flex flex-wrap items-start gap-3">
          <div>
            <label htmlFor="calc-band-kind" className="field-label text-xs">
              Band kind
            </label>
            <select id="calc-band-kind" className="field-input mt-0 py-1" {...register("band.kind")}>
              <option value="">Work it out</option>
              {bandKinds.map((k) => (
                <option key={k}>{k}</option>
              ))}
            </select>
          </div>
          {input("band.lowKHz", "Dial low end", "kHz")}
          {input("band.highKHz", "Dial high end", "kHz")}
          {input("ifKHz", "IF", "kHz")}
          <div>
            <label htmlFor="calc-injection" className="field-label text-xs">
              Oscillator
            </label>
            <select id="calc-injection" className="field-input mt-0 py-1" {...register("injection")}>
              <option value="">Above the signal</option>
              <option value="low">Below the signal</option>
            </select>
          </div>
        </div>
        <fieldset className="flex flex-wrap items-start gap-3">
          <legend className="field-label text-xs">Tuning gang (optional; needed for the design and plot)</legend>
          {input("gang.minPF", "Gang minimum", "pF")}
          {input("gang.maxPF", "Gang maximum", "pF")}
          {input("gang.strayPF", "Strays", "pF", "Optional")}
        </fieldset>
        <fieldset className="flex flex-wrap items-start gap-3">
          <legend className="field-label text-xs">Tracking points (optional; the usual ones are used when empty)</legend>
          {input("trackingPointsKHz.0", "Low", "kHz")}
          {input("trackingPointsKHz.1", "Middle", "kHz")}
          {input("trackingPointsKHz.2", "High", "kHz")}
        </fieldset>
        {formState.errors.root?.message || apiFields._ ? (
          <p className="field-error">{formState.errors.root?.message ?? apiFields._}</p>
        ) : null}
        <button type="submit" className="btn-primary py-1">
          Calculate
        </button>
      </form>
      {q.isFetching ? <p role="status">Calculating…</p> : null}
      {q.isError ? (
        <Notice tone="error" live>
          {errorText(q.error)}
        </Notice>
      ) : null}
      {q.data && !q.isFetching ? <Result r={q.data} /> : null}
    </div>
  );
}
