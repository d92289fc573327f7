"use client";

// Parses with zod in the browser: its settings (no eval, field words) first.
import "@/lib/client/zod-setup";

import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { useForm, type FieldPath } from "react-hook-form";
import { Notice } from "@/components/ui/notice";
import { bandKinds, type Band } from "@/lib/engine/bands/band";
import { alignmentRequestSchema, fieldErrors, type AlignmentRequest, type AlignmentResponse } from "@/lib/engine/requests";
import { formatNumber } from "@/lib/engine/verdicts";
import { api, ApiError, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { DialFitPanel } from "./dial-fit-panel";
import { TrackingPlot } from "./tracking-plot";

type CalcForm = {
  band: { kind: string; lowKHz: string; highKHz: string };
  ifKHz: string;
  injection: string;
  gang: { minPF: string; maxPF: string; strayPF: string };
  trackingPointsKHz: [string, string, string];
  loadedQ: string;
  hotChassis: boolean;
};

const num = (s: string): number | undefined => {
  const t = s.trim().replace(/,/g, "");
  return t === "" ? undefined : Number(t);
};

// Frequency fields go to the engine's door as typed: it reads "1.49 MHz", "455 kHz" or "455k" and names the field otherwise.
const freqText = (s: string): string | undefined => (s.trim() === "" ? undefined : s.trim());

/** The request as JSON, exactly as the route takes it. */
export function toAlignmentRequest(v: CalcForm): AlignmentRequest {
  const tp = v.trackingPointsKHz.map(freqText);
  const gangGiven = v.gang.minPF.trim() !== "" || v.gang.maxPF.trim() !== "";
  const q = num(v.loadedQ);
  return {
    band: {
      lowKHz: freqText(v.band.lowKHz),
      highKHz: freqText(v.band.highKHz),
      ...(v.band.kind ? { kind: v.band.kind as Band["kind"] } : {}),
    },
    ifKHz: freqText(v.ifKHz),
    ...(v.injection === "low" ? { injection: "low" as const } : {}),
    ...(gangGiven
      ? {
          gang: {
            minPF: num(v.gang.minPF) as number,
            maxPF: num(v.gang.maxPF) as number,
            ...(v.gang.strayPF.trim() ? { strayPF: num(v.gang.strayPF) as number } : {}),
          },
        }
      : {}),
    ...(tp.some((x) => x !== undefined) ? { trackingPointsKHz: tp as [string, string, string] } : {}),
    ...(q !== undefined ? { loadedQ: q } : {}),
    ...(v.hotChassis ? { hotChassis: true } : {}),
  };
}

/** The band, IF, oscillator side, gang and points as the dial fit takes them (plain kHz). */
function toDialFitBase(v: CalcForm): Record<string, unknown> & { band: { lowKHz?: number; highKHz?: number } } {
  const r = toAlignmentRequest(v);
  const tp = v.trackingPointsKHz.map(num);
  return {
    band: { lowKHz: num(v.band.lowKHz), highKHz: num(v.band.highKHz), ...(r.band.kind ? { kind: r.band.kind } : {}) },
    ifKHz: num(v.ifKHz),
    ...(r.injection ? { injection: r.injection } : {}),
    ...(r.gang ? { gang: r.gang } : {}),
    ...(tp.some((x) => x !== undefined) ? { trackingPointsKHz: tp } : {}),
  };
}

function formFromBand(b: Band | null, hotChassis: boolean): CalcForm {
  const tp = b?.trackingPointsKHz;
  return {
    band: { kind: b?.kind ?? "MW", lowKHz: String(b?.lowKHz ?? 540), highKHz: String(b?.highKHz ?? 1600) },
    ifKHz: String(b?.ifKHz ?? 455),
    injection: b?.injection === "low" ? "low" : "",
    gang: { minPF: b && b.kind !== "MW" ? "" : "10", maxPF: b && b.kind !== "MW" ? "" : "365", strayPF: "" },
    trackingPointsKHz: tp ? [String(tp[0]), String(tp[1]), String(tp[2])] : ["", "", ""],
    loadedQ: "",
    hotChassis,
  };
}

const f2 = (x: number) => formatNumber(x, 2);
const freq = (kHz: number) => (kHz >= 10000 ? `${formatNumber(kHz / 1000, 3)} MHz` : `${formatNumber(kHz, 2)} kHz`);

function Figure({
  name,
  label,
  value,
  unit,
  format = f2,
}: {
  name: string;
  label: string;
  value: number | null;
  unit: string;
  format?: (x: number) => string;
}) {
  if (value === null) return null;
  return (
    <div>
      <dt className="text-xs text-bakelite-muted">{label}</dt>
      <dd className="figure font-semibold">
        <span data-figure={name}>{format(value)}</span> {unit}
      </dd>
    </div>
  );
}

/** Three significant figures: FM coils are tens of nanohenries, where two decimals of µH say nothing. */
const sig3 = (x: number) => String(Number(x.toPrecision(3)));

/** Inductance as a bench reads it: nH below 1 µH (FM coils), µH with two decimals otherwise. */
function Inductance({ name, label, uH, fm }: { name: string; label: string; uH: number | null; fm: boolean }) {
  if (uH === null) return null;
  return fm ? (
    <Figure name={name.replace(/UH$/, "NH")} label={label} value={uH * 1000} unit="nH" format={sig3} />
  ) : (
    <Figure name={name} label={label} value={uH} unit="µH" />
  );
}

function Result({ r, hotChassis }: { r: AlignmentResponse; hotChassis: boolean }) {
  const d = r.design;
  const fm = r.bandKind === "FM";
  const unit = fm ? "MHz" : "kHz";
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
      {hotChassis ? (
        <Notice tone="caution" title="Hot chassis">
          <p data-caution="isolation-transformer">
            This set&apos;s chassis is tied to one side of the mains. Power it only through an isolation transformer while the generator and
            meters are connected, and follow local codes and licensed practice for work on live equipment.
          </p>
        </Notice>
      ) : null}
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
            {d.method === "three-point"
              ? "Three-point tracking design"
              : d.method === "trimmer-only"
                ? "Two-point tracking design (no padder)"
                : "Signal circuit design"}
          </h4>
          {d.notes.length ? (
            <ul className="list-disc pl-5 text-sm" data-testid="design-notes">
              {d.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          ) : null}
          <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm md:grid-cols-4">
            <Inductance name="design.signalInductanceUH" label="Signal inductance" uH={d.signalInductanceUH} fm={fm} />
            <Figure name="design.signalFixedPF" label="Signal fixed capacitance" value={d.signalFixedPF} unit="pF" />
            <Figure name="design.signalTrimmerPF" label="Signal trimmer" value={d.signalTrimmerPF} unit="pF" />
            <Figure name="design.padderPF" label="Padder" value={d.padderPF} unit="pF" />
            <Figure name="design.oscillatorFixedPF" label="Oscillator fixed capacitance" value={d.oscillatorFixedPF} unit="pF" />
            <Figure name="design.oscillatorTrimmerPF" label="Oscillator trimmer" value={d.oscillatorTrimmerPF} unit="pF" />
            <Inductance name="design.oscillatorInductanceUH" label="Oscillator inductance" uH={d.oscillatorInductanceUH} fm={fm} />
            <Figure
              name="design.sensitivityLossDb"
              label={`Worst sensitivity loss (loaded Q ${formatNumber(d.loadedQ)}${d.loadedQAssumed ? ", assumed" : ""})`}
              value={d.sensitivityLossDb}
              unit="dB"
            />
            <Figure name="design.maxAbsErrorKHz" label="Largest tracking error" value={d.maxAbsErrorKHz} unit="kHz" />
          </dl>
          {d.errorCurve.length ? (
            <TrackingPlot
              curve={d.errorCurve}
              trackingPointsKHz={d.method === "trimmer-only" ? [r.trackingPointsKHz[0], r.trackingPointsKHz[2]] : r.trackingPointsKHz}
              minimaxCurve={d.minimax?.errorCurve ?? null}
              unit={unit}
              sensitivityLossDb={d.sensitivityLossDb}
              minimaxSensitivityLossDb={d.minimax?.sensitivityLossDb ?? null}
              loadedQ={d.loadedQ}
            />
          ) : null}
          {d.minimax ? (
            <p className="text-sm" data-testid="minimax">
              Least-loss points (equal error relative to the antenna circuit&apos;s bandwidth):{" "}
              <span className="figure">{d.minimax.trackingPointsKHz.map((p) => freq(p)).join(", ")}</span>, worst sensitivity loss{" "}
              <span className="figure" data-figure="design.minimax.sensitivityLossDb">
                {f2(d.minimax.sensitivityLossDb)} dB
              </span>{" "}
              (largest error <span className="figure">{f2(d.minimax.maxAbsErrorKHz)} kHz</span>).
            </p>
          ) : null}
          {d.comparisons.length ? (
            <table className="dense-table">
              <caption className="text-left text-xs text-bakelite-muted">Two-point designs, for comparison</caption>
              <thead>
                <tr>
                  <th scope="col">Method</th>
                  <th scope="col">Padder, pF</th>
                  <th scope="col">Oscillator fixed, pF</th>
                  <th scope="col">Oscillator L, µH</th>
                  <th scope="col">Largest error, kHz</th>
                  <th scope="col">Worst loss, dB</th>
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
                        <td className="figure">{f2(c.sensitivityLossDb)}</td>
                      </>
                    ) : (
                      <td colSpan={5}>{c.reason}</td>
                    )}
                  </tr>
                ))}
              </tbody>
            </table>
          ) : null}
        </section>
      ) : (
        <p className="text-sm text-bakelite-muted">
          Give the gang capacitance (minimum and maximum) to solve the tracking design and plot the error.
        </p>
      )}
    </div>
  );
}

/**
 * The alignment calculator. `hotChassis` (an AC/DC set's job) puts the isolation-transformer caution at the
 * head of the plan and above it. On a job, `jobId` lets the dial fit read the bench sheet.
 */
export function AlignmentCalculator({ bands = [], hotChassis = false, jobId }: { bands?: Band[]; hotChassis?: boolean; jobId?: string }) {
  const [request, setRequest] = useState<AlignmentRequest | null>(null);
  const [bandIndex, setBandIndex] = useState(0);
  const form = useForm<CalcForm>({ defaultValues: formFromBand(bands[0] ?? null, hotChassis) });
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
    const body = toAlignmentRequest(v);
    const parsed = alignmentRequestSchema.safeParse(body);
    if (!parsed.success) {
      for (const [k, m] of Object.entries(fieldErrors(parsed.error)))
        setError((k === "_" ? "root" : k) as FieldPath<CalcForm>, { message: m });
      return;
    }
    setRequest(body);
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
            inputMode={unit === "kHz" ? "text" : "decimal"}
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
                reset(formFromBand(bands[i] ?? null, hotChassis));
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
              <option value="">From the dial range</option>
              {bandKinds.map((k) => (
                <option key={k}>{k}</option>
              ))}
            </select>
          </div>
          {input("band.lowKHz", "Dial low end", "kHz", "Or with a unit: 1.49 MHz")}
          {input("band.highKHz", "Dial high end", "kHz")}
          {input("ifKHz", "IF", "kHz", "455, 455k or 10.7 MHz")}
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
        <label className="inline-flex items-center gap-2 text-sm">
          <input type="checkbox" {...register("hotChassis")} />
          AC/DC set: the chassis is tied to the mains (hot chassis)
        </label>
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
        <fieldset className="flex flex-wrap items-start gap-3">
          <legend className="field-label text-xs">Antenna circuit (optional; for the sensitivity loss and image rejection)</legend>
          {input("loadedQ", "Loaded Q", "", "A typical figure is assumed when empty")}
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
      {q.data && !q.isFetching ? <Result r={q.data} hotChassis={request?.hotChassis === true} /> : null}
      <DialFitPanel key={bandIndex} jobId={jobId} bandIndex={bandIndex} requestBase={() => toDialFitBase(form.getValues())} />
    </div>
  );
}
