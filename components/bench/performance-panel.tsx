"use client";

// Parses with zod in the browser: its settings (no eval, field words) first.
import "@/lib/client/zod-setup";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { passbandRows } from "@/lib/engine/certificates/performance-section";
import {
  judgePerformance,
  performanceConditionsSchema,
  toMicrovolts,
  toMilliwatts,
  type PerformanceConditions,
  type SignalUnit,
} from "@/lib/engine/performance";
import { formatNumber, judgeReading, readingValueProblem } from "@/lib/engine/verdicts";
import { parseSweepText } from "@/lib/validation/performance";
import { api, ApiError, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { PassbandPlot } from "./passband-plot";
import type { BenchSheetJson } from "./types";
import { VerdictBadge } from "./verdict-badge";

type Perf = BenchSheetJson["performance"];
type Row = Perf["requirements"][number];
type Sweep = Perf["sweeps"][number];

const GROUP_TITLE = (code: string): string => {
  if (code.startsWith("perf.sensitivity.")) return `Sensitivity, band ${Number(code.split(".")[2]) + 1}`;
  if (code === "perf.audio") return "Noise, AVC, output and hum";
  if (code === "perf.transistor") return "Transistor set: idle current and bias";
  if (code === "perf.tubes") return "Tubes on the tester (against the tester's minimum)";
  return code;
};

// The units a reading may be typed in; it is stored in the first.
const ENTRY_UNITS: Partial<Record<Row["unit"], string[]>> = { µV: ["µV", "dBµV", "dBm"], mW: ["mW", "V"] };

const numberOrNull = (text: string): number | null | undefined => {
  const s = text.trim().replace(/[−–]/g, "-").replace(/,/g, "");
  if (s === "") return null;
  const n = Number(s);
  return Number.isFinite(n) ? n : undefined;
};

function PerformanceRow({ r, jobId, editable, loadOhms }: { r: Row; jobId: string; editable: boolean; loadOhms: number }) {
  const qc = useQueryClient();
  const units = ENTRY_UNITS[r.unit] ?? [r.unit];
  const [unit, setUnit] = useState(units[0]!);
  const [text, setText] = useState(r.value === null ? "" : formatNumber(r.value, 4));
  const [figureText, setFigureText] = useState(r.figure === null ? "" : formatNumber(r.figure, 4));
  const [error, setError] = useState<string | null>(null);
  const id = `pf-${r.key.replaceAll(".", "-")}`;

  let value: number | null | undefined = numberOrNull(text);
  let problem: string | null = value === undefined ? "Enter a number." : null;
  if (value !== null && value !== undefined && unit !== r.unit) {
    try {
      value = r.unit === "µV" ? toMicrovolts(value, unit as SignalUnit) : toMilliwatts(value, unit as "V", loadOhms);
    } catch (e) {
      problem = e instanceof Error ? e.message : "Enter a number.";
      value = undefined;
    }
  }
  if (!problem && value !== null && value !== undefined) problem = readingValueProblem(r, value);
  const figure = numberOrNull(figureText);
  const figureProblem =
    figure === undefined ? "Enter a number, or leave it empty." : figure === null ? null : readingValueProblem(r, figure);
  // The verdict as typed, against the figure as typed: the same judgement the server makes once saved.
  const live =
    problem || value === undefined
      ? "invalid"
      : figureProblem || figure === undefined
        ? judgeReading(r, value).verdict
        : judgePerformance(r.direction, figure, r.unit, value).verdict;
  const dirty = (value ?? null) !== r.value || (figure ?? null) !== r.figure;

  const save = useMutation({
    mutationFn: async () => {
      if ((figure ?? null) !== r.figure)
        await api(`/api/bench/jobs/${jobId}/performance`, { method: "PUT", body: { enabled: true, figures: { [r.key]: figure ?? null } } });
      if ((value ?? null) !== r.value)
        await api(`/api/bench/jobs/${jobId}/readings`, { method: "POST", body: { key: r.key, value: value ?? null } });
    },
    onSuccess: () => {
      setError(null);
      if (unit !== r.unit) {
        setUnit(r.unit);
        setText(value === null || value === undefined ? "" : formatNumber(value, 4));
      }
    },
    onError: (e) => setError(e instanceof ApiError ? (Object.values(e.fields)[0] ?? e.message) : errorText(e)),
    onSettled: () => void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) }),
  });
  const onSave = () => {
    if (problem || figureProblem || value === undefined || figure === undefined) {
      setError(problem ?? figureProblem ?? "Enter a number.");
      return;
    }
    save.mutate();
  };
  return (
    <tr data-performance={r.key} data-verdict={live}>
      <th scope="row" className="font-normal">
        <label htmlFor={id}>{r.label}</label>
      </th>
      <td>
        <div className="flex items-center gap-1">
          <input
            id={id}
            inputMode="decimal"
            autoComplete="off"
            className="field-input figure mt-0 w-24 py-0.5 text-right"
            value={text}
            disabled={!editable}
            aria-invalid={live === "invalid" && text.trim() !== "" ? true : undefined}
            aria-describedby={`${id}-tol${error || (problem && text.trim() !== "") ? ` ${id}-error` : ""}`}
            onChange={(e) => setText(e.target.value)}
            onKeyDown={(e) => {
              if (e.key === "Enter") {
                e.preventDefault();
                onSave();
              }
            }}
          />
          {units.length > 1 ? (
            <select
              aria-label={`Unit for ${r.label}`}
              className="field-input mt-0 w-auto py-0.5 text-sm"
              value={unit}
              disabled={!editable}
              onChange={(e) => setUnit(e.target.value)}
            >
              {units.map((u) => (
                <option key={u} value={u}>
                  {u === "dBm" ? "dBm (50 Ω)" : u === "V" ? "V rms" : u}
                </option>
              ))}
            </select>
          ) : (
            <span className="figure text-sm">{r.unit}</span>
          )}
        </div>
        {unit !== r.unit && value !== null && value !== undefined && !problem ? (
          <span className="block figure text-xs text-bakelite-muted">
            = {formatNumber(value, 3)} {r.unit}
          </span>
        ) : null}
        {error || (problem && text.trim() !== "") ? (
          <p id={`${id}-error`} className="field-error">
            {error ?? problem}
          </p>
        ) : null}
      </td>
      <td>
        <label className="sr-only" htmlFor={`${id}-figure`}>
          {r.figureSource === "the tester's minimum" ? "Tester's minimum" : "Service figure"} for {r.label}, {r.unit}
        </label>
        <input
          id={`${id}-figure`}
          inputMode="decimal"
          autoComplete="off"
          placeholder="none"
          className="field-input figure mt-0 w-20 py-0.5 text-right"
          value={figureText}
          disabled={!editable}
          aria-invalid={figureProblem ? true : undefined}
          onChange={(e) => setFigureText(e.target.value)}
        />
        {figureProblem ? <p className="field-error">{figureProblem}</p> : null}
      </td>
      <td id={`${id}-tol`} className="text-xs">
        {r.toleranceText}
      </td>
      <td aria-live="polite">
        <VerdictBadge verdict={live} />
      </td>
      <td className="text-xs text-bakelite-muted">
        {save.isPending ? (
          "Saving…"
        ) : dirty ? (
          <button type="button" className="btn-quiet px-1 py-0 text-xs" onClick={onSave} disabled={!editable}>
            Save<span className="sr-only"> {r.label}</span>
          </button>
        ) : r.recordedAt ? (
          <span>Saved{r.recordedByName ? ` by ${r.recordedByName}` : ""}</span>
        ) : (
          "—"
        )}
      </td>
    </tr>
  );
}

const CONDITION_FIELDS: { key: keyof PerformanceConditions; label: string }[] = [
  { key: "referenceOutputMW", label: "Reference output, mW" },
  { key: "loadOhms", label: "Load, Ω" },
  { key: "modulationPercent", label: "Modulation, %" },
  { key: "modulationHz", label: "Modulation frequency, Hz" },
  { key: "snrInputUV", label: "Signal-to-noise input, µV" },
  { key: "avcLowUV", label: "AVC input, low, µV" },
  { key: "avcHighUV", label: "AVC input, high, µV" },
  { key: "distortionPercent", label: "Distortion at maximum output, %" },
  { key: "batteryVolts", label: "Nominal battery voltage, V" },
];

function Conditions({ perf, jobId, editable }: { perf: Perf; jobId: string; editable: boolean }) {
  const qc = useQueryClient();
  const [values, setValues] = useState<Record<string, string>>(() =>
    Object.fromEntries(CONDITION_FIELDS.map((f) => [f.key, perf.conditions[f.key] === undefined ? "" : String(perf.conditions[f.key])])),
  );
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);
  const m = useMutation({
    mutationFn: (conditions: PerformanceConditions) =>
      api(`/api/bench/jobs/${jobId}/performance`, { method: "PUT", body: { enabled: true, conditions } }),
    onSuccess: () => setSaved(true),
    onError: (e) => setErrors({ form: errorText(e) }),
    onSettled: () => void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) }),
  });
  return (
    <details className="mt-2 text-sm">
      <summary className="cursor-pointer">Conditions the readings are taken under</summary>
      <form
        noValidate
        className="mt-2 grid gap-2 sm:grid-cols-3"
        onSubmit={(e) => {
          e.preventDefault();
          setSaved(false);
          const raw = Object.fromEntries(
            Object.entries(values)
              .filter(([, v]) => v.trim() !== "")
              .map(([k, v]) => [k, Number(v.trim())]),
          );
          const parsed = performanceConditionsSchema.safeParse(raw);
          if (!parsed.success) {
            setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
            return;
          }
          setErrors({});
          m.mutate(parsed.data);
        }}
      >
        {CONDITION_FIELDS.map((f) => (
          <div key={f.key}>
            <label htmlFor={`pc-${f.key}`} className="block text-xs">
              {f.label}
            </label>
            <input
              id={`pc-${f.key}`}
              inputMode="decimal"
              className="field-input figure mt-0 py-0.5"
              value={values[f.key] ?? ""}
              disabled={!editable}
              aria-invalid={errors[f.key] ? true : undefined}
              aria-describedby={errors[f.key] ? `pc-${f.key}-error` : undefined}
              onChange={(e) => setValues((v) => ({ ...v, [f.key]: e.target.value }))}
            />
            {errors[f.key] ? (
              <p id={`pc-${f.key}-error`} className="field-error">
                {errors[f.key]}
              </p>
            ) : null}
          </div>
        ))}
        <div className="sm:col-span-3">
          <button type="submit" className="btn-secondary py-1" disabled={!editable || m.isPending}>
            Save conditions
          </button>
          {saved ? (
            <span className="ml-2 text-xs" role="status">
              Saved.
            </span>
          ) : null}
          {errors.form ? <p className="field-error">{errors.form}</p> : null}
        </div>
      </form>
    </details>
  );
}

const ifLabel = (kHz: number) => (kHz >= 10000 ? `${formatNumber(kHz / 1000, 4)} MHz` : `${formatNumber(kHz, 3)} kHz`);

function SweepEditor({
  jobId,
  ifKHz,
  curve,
  sweep,
  editable,
}: {
  jobId: string;
  ifKHz: number;
  curve: "response" | "discriminator";
  sweep: Sweep | undefined;
  editable: boolean;
}) {
  const qc = useQueryClient();
  const id = `pb-${String(ifKHz).replace(".", "-")}-${curve}`;
  const pts = sweep ? sweep.points.map((p) => ({ offsetKHz: p.offsetKHz, value: "db" in p ? p.db : p.volts })) : [];
  const [text, setText] = useState(pts.map((p) => `${p.offsetKHz} ${p.value}`).join("\n"));
  const [method, setMethod] = useState<"sweep" | "generator">(sweep?.method ?? "generator");
  const [error, setError] = useState<string | null>(null);
  const m = useMutation({
    mutationFn: (body: unknown) => api(`/api/bench/jobs/${jobId}/passband`, { method: "POST", body }),
    onSuccess: () => setError(null),
    onError: (e) => setError(e instanceof ApiError ? (Object.values(e.fields)[0] ?? e.message) : errorText(e)),
    onSettled: () => void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) }),
  });
  const title = curve === "response" ? `IF response at ${ifLabel(ifKHz)}` : `FM discriminator at ${ifLabel(ifKHz)}`;
  const row = sweep ? passbandRows([sweep.curve === "response" ? responseSection(sweep) : discriminatorSection(sweep)])[0]! : null;
  return (
    <section aria-labelledby={`${id}-heading`} className="rounded border border-dial-rule p-2" data-sweep={`${ifKHz}:${curve}`}>
      <h5 id={`${id}-heading`} className="font-semibold">
        {title}
      </h5>
      <div className="grid gap-3 lg:grid-cols-[16rem_1fr]">
        <form
          noValidate
          className="space-y-1"
          onSubmit={(e) => {
            e.preventDefault();
            const parsed = parseSweepText(text);
            if ("error" in parsed) return setError(parsed.error);
            const points =
              curve === "response"
                ? parsed.points.map((p) => ({ offsetKHz: p.offsetKHz, db: p.value }))
                : parsed.points.map((p) => ({ offsetKHz: p.offsetKHz, volts: p.value }));
            m.mutate({ curve, ifKHz, method, points });
          }}
        >
          <label htmlFor={`${id}-points`} className="block text-xs">
            One point a line: offset from the IF in kHz, then{" "}
            {curve === "response" ? "the response in dB (any reference)" : "the output in V"}
          </label>
          <textarea
            id={`${id}-points`}
            rows={6}
            className="field-input figure"
            value={text}
            disabled={!editable}
            placeholder={curve === "response" ? "-10 -14\n-5 -4\n0 0\n5 -4.2\n10 -14.5" : "-100 -1.2\n-50 -0.8\n0 0.05\n50 0.85\n100 1.1"}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${id}-error` : undefined}
            onChange={(e) => setText(e.target.value)}
          />
          <label htmlFor={`${id}-method`} className="block text-xs">
            Taken
          </label>
          <select
            id={`${id}-method`}
            className="field-input mt-0 py-0.5"
            value={method}
            disabled={!editable}
            onChange={(e) => setMethod(e.target.value as "sweep" | "generator")}
          >
            <option value="generator">point by point with a generator</option>
            <option value="sweep">from a sweep</option>
          </select>
          <button type="submit" className="btn-secondary py-1" disabled={!editable || m.isPending}>
            {m.isPending ? "Saving…" : "Save the points"}
          </button>
          {error ? (
            <p id={`${id}-error`} className="field-error" role="alert">
              {error}
            </p>
          ) : null}
        </form>
        {sweep && row ? (
          <div className="space-y-2">
            <ul className="text-sm" data-testid={`${id}-figures`}>
              {row.figures.map((f) => (
                <li key={f} className="figure">
                  {f}
                </li>
              ))}
              {sweep.result.notes.map((n) => (
                <li key={n} className="text-xs text-bakelite-muted">
                  {n}
                </li>
              ))}
            </ul>
            <PassbandPlot
              id={id}
              curve={curve}
              ifText={ifLabel(ifKHz)}
              points={pts}
              summary={row.figures.join("; ")}
              marks={
                sweep.curve === "response"
                  ? {
                      peakDb: sweep.result.peakDb,
                      edges3: [sweep.result.db3.lowerKHz, sweep.result.db3.upperKHz],
                      edges6: [sweep.result.db6.lowerKHz, sweep.result.db6.upperKHz],
                    }
                  : { crossing: sweep.result.zeroCrossingKHz, linear: [sweep.result.linearLowKHz, sweep.result.linearHighKHz] }
              }
            />
            <table className="dense-table text-xs">
              <caption className="text-left text-xs text-bakelite-muted">The points as read</caption>
              <thead>
                <tr>
                  <th scope="col">Offset, kHz</th>
                  <th scope="col">{curve === "response" ? "Response, dB" : "Output, V"}</th>
                </tr>
              </thead>
              <tbody>
                {pts.map((p) => (
                  <tr key={p.offsetKHz}>
                    <td className="figure">{formatNumber(p.offsetKHz, 3)}</td>
                    <td className="figure">{formatNumber(p.value, 3)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : (
          <p className="text-xs text-bakelite-muted">No points yet. The bandwidths and the plot appear once the points are saved.</p>
        )}
      </div>
    </section>
  );
}

function responseSection(s: Extract<Sweep, { curve: "response" }>) {
  return {
    curve: "response" as const,
    ifKHz: s.ifKHz,
    method: s.method,
    points: s.points,
    peakOffsetKHz: s.result.peakOffsetKHz,
    centreKHz: s.result.centreKHz,
    width3KHz: s.result.db3.widthKHz,
    width6KHz: s.result.db6.widthKHz,
    symmetry3KHz: s.result.db3.symmetryKHz,
    symmetry6KHz: s.result.db6.symmetryKHz,
  };
}

function discriminatorSection(s: Extract<Sweep, { curve: "discriminator" }>) {
  return {
    curve: "discriminator" as const,
    ifKHz: s.ifKHz,
    method: s.method,
    points: s.points,
    zeroCrossingKHz: s.result.zeroCrossingKHz,
    linearLowKHz: s.result.linearLowKHz,
    linearHighKHz: s.result.linearHighKHz,
    linearityPercent: s.result.linearityPercent,
  };
}

/** The optional performance readings and IF sweeps of a job: off until the technician opts in. */
export function PerformancePanel({ sheet, jobId }: { sheet: BenchSheetJson; jobId: string }) {
  const qc = useQueryClient();
  const perf = sheet.performance;
  const [error, setError] = useState<string | null>(null);
  const toggle = useMutation({
    mutationFn: (enabled: boolean) => api(`/api/bench/jobs/${jobId}/performance`, { method: "PUT", body: { enabled } }),
    onSuccess: () => setError(null),
    onError: (e) => setError(errorText(e)),
    onSettled: () => void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) }),
  });
  const groups: { code: string; rows: Row[] }[] = [];
  for (const r of perf.requirements) {
    const g = groups.find((x) => x.code === r.lineCode);
    if (g) g.rows.push(r);
    else groups.push({ code: r.lineCode, rows: [r] });
  }
  return (
    <section aria-labelledby="performance-heading" className="card overflow-x-auto p-3" data-testid="performance-panel">
      <h3 id="performance-heading" className="text-lg font-semibold">
        Performance
      </h3>
      <label className="mt-1 inline-flex items-start gap-2 text-sm">
        <input
          type="checkbox"
          className="mt-1"
          // Shows the choice at once; the sheet's answer then confirms it, or it flips back with the error.
          checked={toggle.isPending ? Boolean(toggle.variables) : perf.enabled}
          disabled={!sheet.editable || toggle.isPending}
          onChange={(e) => toggle.mutate(e.target.checked)}
        />
        <span>
          Take performance readings on this job
          <span className="block text-xs text-bakelite-muted">
            Optional: sensitivity, noise, AVC, output, hum and the checks for this kind of set, and the IF passband. They go on the
            certificate when measured and never hold up completion. Each is judged against the service figure you enter; without one it is
            recorded.
          </span>
        </span>
      </label>
      {error ? (
        <p className="field-error" role="alert">
          {error}
        </p>
      ) : null}
      {perf.enabled ? (
        <>
          <Conditions perf={perf} jobId={jobId} editable={sheet.editable} />
          <table className="dense-table mt-2">
            <thead>
              <tr>
                <th scope="col">Reading</th>
                <th scope="col">Value</th>
                <th scope="col">Service figure</th>
                <th scope="col">Judged against</th>
                <th scope="col">Verdict</th>
                <th scope="col">Saved</th>
              </tr>
            </thead>
            {groups.map((g) => (
              <tbody key={g.code}>
                <tr>
                  <th colSpan={6} scope="colgroup" className="bg-dial-deep text-left text-xs uppercase tracking-wide">
                    {GROUP_TITLE(g.code)}
                  </th>
                </tr>
                {g.rows.map((r) => (
                  <PerformanceRow
                    key={`${r.key}:${r.value}:${r.figure}`}
                    r={r}
                    jobId={jobId}
                    editable={sheet.editable}
                    loadOhms={perf.conditions.loadOhms}
                  />
                ))}
              </tbody>
            ))}
          </table>
          <h4 className="mt-3 font-semibold">IF passband</h4>
          <p className="text-xs text-bakelite-muted">
            Relative response at offsets around the IF, from a sweep or point by point with a generator. The −3 dB and −6 dB edges are found
            by interpolation between the points; symmetry is the upper half-width less the lower, from the peak.
          </p>
          <div className="mt-2 space-y-3">
            {perf.strips.flatMap((s) =>
              s.curves.map((curve) => (
                <SweepEditor
                  key={`${s.ifKHz}:${curve}:${perf.sweeps.find((w) => w.ifKHz === s.ifKHz && w.curve === curve)?.recordedAt ?? ""}`}
                  jobId={jobId}
                  ifKHz={s.ifKHz}
                  curve={curve}
                  sweep={perf.sweeps.find((w) => w.ifKHz === s.ifKHz && w.curve === curve)}
                  editable={sheet.editable}
                />
              )),
            )}
          </div>
        </>
      ) : null}
    </section>
  );
}
