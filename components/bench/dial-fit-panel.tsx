"use client";

// Parses with zod in the browser: its settings (no eval, field words) first.
import "@/lib/client/zod-setup";

import { useMutation, useQuery } from "@tanstack/react-query";
import { useRef } from "react";
import { useFieldArray, useForm, useWatch } from "react-hook-form";
import { Notice } from "@/components/ui/notice";
import { TableScroll } from "@/components/ui/table-scroll";
import { ruleOfThumbPoints } from "@/lib/engine/alignment/tracking-points";
import { dialFitRequestSchema, fieldErrors, type DialFitResponse } from "@/lib/engine/requests";
import { formatNumber, parseReadingKey } from "@/lib/engine/verdicts";
import { api, ApiError, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { DialFitPlot } from "./dial-fit-plot";
import type { BenchSheetJson } from "./types";
import { VerdictBadge } from "./verdict-badge";

type Row = { dialKHz: string; value: string };
type FitForm = { readingKind: "received" | "lo"; lowEndAdjuster: "coil" | "padder"; rows: Row[] };

/** What the calculator above holds: band, IF, injection, gang and tracking points, as its request. */
type Base = { band?: { lowKHz?: number; highKHz?: number; kind?: string } } & Record<string, unknown>;

const num = (s: string): number | undefined => {
  const t = s.trim().replace(/,/g, "");
  return t === "" ? undefined : Number(t);
};
const f1 = (x: number) => formatNumber(x, 1);
const f2 = (x: number) => formatNumber(x, 2);
const signed = (x: number, digits = 1) => {
  const shown = formatNumber(Math.abs(x), digits);
  return Number(shown) === 0 ? "0" : `${x >= 0 ? "+" : "−"}${shown}`;
};

/** The band's ends and the usual tracking points: where a technician reads the dial. */
function usualMarks(base: Base): string[] {
  const low = base.band?.lowKHz;
  const high = base.band?.highKHz;
  if (!(typeof low === "number" && typeof high === "number" && low > 0 && high > low)) return ["", "", "", ""];
  try {
    const [a, b, c] = ruleOfThumbPoints({ lowKHz: low, highKHz: high });
    return [...new Set([low, a, b, c, high])].map(String);
  } catch {
    return [String(low), String(high)];
  }
}

const ROOT_LABEL: Record<string, string> = {
  band: "Band",
  ifKHz: "IF",
  gang: "Gang",
  trackingPointsKHz: "Tracking points",
  injection: "Oscillator",
};

function Result({ r, readingKind }: { r: DialFitResponse; readingKind: "received" | "lo" }) {
  const unit = r.bandKind === "FM" ? "MHz" : "kHz";
  return (
    <div className="space-y-3" data-testid="dial-fit-result" data-in-tolerance={r.inTolerance}>
      <Notice tone={r.inTolerance ? "success" : "caution"} title={r.inTolerance ? "In tolerance" : "Out of tolerance"}>
        <p data-testid="dial-fit-summary">{r.summary}</p>
      </Notice>
      <dl className="card grid grid-cols-2 gap-x-4 gap-y-1 p-3 text-sm md:grid-cols-4">
        <div>
          <dt className="text-xs text-bakelite-muted">Oscillator coil against the design</dt>
          <dd className="figure font-semibold">
            <span data-figure="fit.inductanceErrorPct">{signed(r.fit.inductanceErrorPct, 2)}</span> %
          </dd>
        </div>
        <div>
          <dt className="text-xs text-bakelite-muted">Parallel capacitance against the design</dt>
          <dd className="figure font-semibold">
            <span data-figure="fit.parallelErrorPF">{signed(r.fit.parallelErrorPF, 2)}</span> pF
          </dd>
        </div>
        <div>
          <dt className="text-xs text-bakelite-muted">Residual of the fit (RMS)</dt>
          <dd className="figure font-semibold">
            <span data-figure="fit.residualKHz">{f2(r.fit.residualKHz)}</span> kHz{" "}
            <span className="font-normal text-bakelite-muted">(reading resolution {f1(r.resolutionKHz)} kHz)</span>
          </dd>
        </div>
        <div>
          <dt className="text-xs text-bakelite-muted">Gang</dt>
          <dd className="figure" data-figure="gang">
            {f1(r.gang.minPF)}–{f1(r.gang.maxPF)} pF{r.gang.source === "default" ? `, assumed for ${r.bandKind}` : ""}
          </dd>
        </div>
      </dl>
      {r.gang.source === "default" ? (
        <p className="text-xs text-bakelite-muted">
          No gang was given, so the usual {r.bandKind} gang of {f1(r.gang.minPF)}–{f1(r.gang.maxPF)} pF is assumed. Give the set&apos;s own
          gang above for figures that fit it.
        </p>
      ) : null}
      {r.steps.length ? (
        <section className="card p-3" aria-labelledby="dial-fit-steps-heading">
          <h4 id="dial-fit-steps-heading" className="font-semibold">
            What to turn
          </h4>
          <ol className="list-decimal space-y-1 pl-5 text-sm">
            {r.steps.map((s) => (
              <li key={s.order} data-step={s.adjust} data-direction={s.direction}>
                {s.text}
              </li>
            ))}
          </ol>
          <p className="mt-1 text-xs text-bakelite-muted">
            Then take new readings at the same marks and fit again, until every mark is in tolerance.
          </p>
        </section>
      ) : null}
      <div className="card p-3">
        <p id="dial-fit-table-caption" className="text-xs text-bakelite-muted">
          Dial error at each mark ({r.toleranceText}){readingKind === "lo" ? "; the received frequency is the LO less the IF" : ""}
        </p>
        <TableScroll label="Dial error at each mark, now and after">
          <table className="dense-table" aria-labelledby="dial-fit-table-caption">
            <thead>
              <tr>
                <th scope="col">Mark, kHz</th>
                <th scope="col">Received now, kHz</th>
                <th scope="col">Error now, kHz</th>
                <th scope="col">Now</th>
                <th scope="col">Predicted after, kHz</th>
                <th scope="col">Error after, kHz</th>
                <th scope="col">After</th>
              </tr>
            </thead>
            <tbody>
              {r.before.map((b, i) => {
                const a = r.after[i]!;
                return (
                  <tr key={i} data-mark={b.dialKHz}>
                    <th scope="row" className="figure font-normal">
                      {f2(b.dialKHz)}
                    </th>
                    <td className="figure">{f2(b.receivedKHz)}</td>
                    <td className="figure">{signed(b.errorKHz)}</td>
                    <td>
                      <VerdictBadge verdict={b.verdict} />
                    </td>
                    <td className="figure">{f2(a.receivedKHz)}</td>
                    <td className="figure">{signed(a.errorKHz)}</td>
                    <td>
                      <VerdictBadge verdict={a.verdict} />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </TableScroll>
      </div>
      <DialFitPlot
        before={r.curves.before}
        after={r.curves.after}
        readings={r.before.map((b) => ({ dialKHz: b.dialKHz, errorKHz: b.errorKHz }))}
        tolerance={r.tolerance}
        unit={unit}
      />
    </div>
  );
}

/**
 * The dial-calibration fit: readings of where the set tunes at several marks → the oscillator's drift and
 * which part to turn. Uses the band, IF, gang and points of the calculator it sits under.
 */
export function DialFitPanel({ requestBase, jobId, bandIndex = 0 }: { requestBase: () => Base; jobId?: string; bandIndex?: number }) {
  // On a job, the bench sheet's received-frequency readings of this band (its ends and tracking points) can seed the fit.
  const sheet = useQuery({
    queryKey: benchKeys.sheet(jobId ?? ""),
    queryFn: () => api<BenchSheetJson>(`/api/bench/jobs/${jobId}/sheet`),
    enabled: Boolean(jobId),
  });
  const sheetRows: Row[] = (sheet.data?.requirements ?? [])
    .filter((r) => {
      const k = parseReadingKey(r.key);
      return k !== null && (k.kind === "edge" || k.kind === "track") && k.band === bandIndex && r.value !== null && r.nominal !== null;
    })
    .map((r) => ({ dialKHz: String(r.nominal), value: String(r.value) }))
    .sort((a, b) => Number(a.dialKHz) - Number(b.dialKHz));
  const firstValue = useRef<HTMLInputElement | null>(null);
  const form = useForm<FitForm>({
    defaultValues: {
      readingKind: "received",
      lowEndAdjuster: "coil",
      rows: usualMarks(requestBase()).map((d) => ({ dialKHz: d, value: "" })),
    },
  });
  const { register, handleSubmit, formState, setError, clearErrors, control, setValue, getValues } = form;
  const rows = useFieldArray({ control, name: "rows" });
  const fit = useMutation({
    mutationFn: (body: unknown) => api<DialFitResponse>("/api/tools/dial-fit", { method: "POST", body }),
  });
  const apiFields = fit.error instanceof ApiError ? fit.error.fields : {};

  const submit = handleSubmit((v) => {
    clearErrors();
    fit.reset();
    const key = v.readingKind === "lo" ? "loKHz" : "receivedKHz";
    const readings = v.rows
      .map((r, i) => ({ i, dialKHz: num(r.dialKHz), value: num(r.value) }))
      .filter((r) => r.dialKHz !== undefined || r.value !== undefined);
    const body = {
      ...requestBase(),
      lowEndAdjuster: v.lowEndAdjuster,
      readings: readings.map((r) => ({ dialKHz: r.dialKHz, ...(r.value === undefined ? {} : { [key]: r.value }) })),
    };
    const parsed = dialFitRequestSchema.safeParse(body);
    if (!parsed.success) {
      for (const [k, m] of Object.entries(fieldErrors(parsed.error))) {
        const at = /^readings\.(\d+)\.(\w+)$/.exec(k);
        if (at) {
          const row = readings[Number(at[1])]?.i ?? 0;
          setError(`rows.${row}.${at[2] === "dialKHz" ? "dialKHz" : "value"}`, { message: m });
        } else if (k === "readings") setError("rows", { message: m });
        else setError("root", { message: `${ROOT_LABEL[k.split(".")[0] ?? ""] ?? k}: ${m}` });
      }
      return;
    }
    fit.mutate(parsed.data);
  });

  // A row's message: the form's own check first, then the server's (mapped back through the rows sent).
  const sentRows = () =>
    getValues("rows")
      .map((r, i) => ({ i, used: r.dialKHz.trim() !== "" || r.value.trim() !== "" }))
      .filter((r) => r.used)
      .map((r) => r.i);
  const serverRowError = (row: number, part: "dialKHz" | "value"): string | undefined => {
    const index = sentRows().indexOf(row);
    if (index < 0) return undefined;
    return part === "dialKHz"
      ? apiFields[`readings.${index}.dialKHz`]
      : (apiFields[`readings.${index}.receivedKHz`] ?? apiFields[`readings.${index}.loKHz`]);
  };
  const otherServerErrors = Object.entries(apiFields).filter(([k]) => !k.startsWith("readings."));
  const kind = useWatch({ control, name: "readingKind" });

  return (
    <section className="space-y-3" aria-labelledby="dial-fit-heading">
      <form noValidate onSubmit={submit} className="card space-y-3 p-3" aria-labelledby="dial-fit-heading">
        <div>
          <h3 id="dial-fit-heading" className="text-lg font-semibold">
            Dial calibration: fit and advice
          </h3>
          <p className="max-w-prose text-xs text-bakelite-muted">
            Read where the set actually tunes at several dial marks (a generator heard at the mark, or the LO on a frequency counter), near
            both ends of the band. The fit finds how far the oscillator coil and its parallel capacitance have drifted from the design above
            and says which adjustment to turn. Work with the back off only as the set&apos;s cautions allow: on a hot-chassis set use an
            isolation transformer and an insulated trimming tool.
          </p>
        </div>
        <div className="flex flex-wrap items-start gap-3">
          <div>
            <label htmlFor="fit-reading-kind" className="field-label text-xs">
              Readings are
            </label>
            <select id="fit-reading-kind" className="field-input mt-0 py-1" {...register("readingKind")}>
              <option value="received">Received (generator)</option>
              <option value="lo">LO on a counter</option>
            </select>
          </div>
          <div>
            <label htmlFor="fit-low-end" className="field-label text-xs">
              Low end set by
            </label>
            <select id="fit-low-end" className="field-input mt-0 py-1" {...register("lowEndAdjuster")}>
              <option value="coil">Oscillator coil slug</option>
              <option value="padder">Padder</option>
            </select>
          </div>
        </div>
        <table className="dense-table">
          <caption className="text-left text-xs text-bakelite-muted">Readings, one per mark (empty rows are left out)</caption>
          <thead>
            <tr>
              <th scope="col">Dial mark, kHz</th>
              <th scope="col">{kind === "lo" ? "LO, kHz" : "Received, kHz"}</th>
              <th scope="col">
                <span className="sr-only">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.fields.map((f, i) => {
              const markError = formState.errors.rows?.[i]?.dialKHz?.message ?? serverRowError(i, "dialKHz");
              const valueError = formState.errors.rows?.[i]?.value?.message ?? serverRowError(i, "value");
              const reg = register(`rows.${i}.value`);
              return (
                <tr key={f.id} data-fit-row={i}>
                  <td>
                    <input
                      id={`fit-mark-${i}`}
                      aria-label={`Dial mark ${i + 1}, kHz`}
                      inputMode="decimal"
                      autoComplete="off"
                      className="field-input figure mt-0 w-28 py-0.5 text-right"
                      aria-invalid={markError ? true : undefined}
                      aria-describedby={markError ? `fit-mark-${i}-error` : undefined}
                      {...register(`rows.${i}.dialKHz`)}
                    />
                    {markError ? (
                      <p id={`fit-mark-${i}-error`} className="field-error text-xs">
                        {markError}
                      </p>
                    ) : null}
                  </td>
                  <td>
                    <input
                      id={`fit-value-${i}`}
                      aria-label={`${kind === "lo" ? "LO" : "Received frequency"} at mark ${i + 1}, kHz`}
                      inputMode="decimal"
                      autoComplete="off"
                      className="field-input figure mt-0 w-28 py-0.5 text-right"
                      aria-invalid={valueError ? true : undefined}
                      aria-describedby={valueError ? `fit-value-${i}-error` : undefined}
                      {...reg}
                      ref={(el) => {
                        reg.ref(el);
                        if (i === 0) firstValue.current = el;
                      }}
                    />
                    {valueError ? (
                      <p id={`fit-value-${i}-error`} className="field-error text-xs">
                        {valueError}
                      </p>
                    ) : null}
                  </td>
                  <td>
                    <button type="button" className="btn-quiet px-1 py-0 text-xs" onClick={() => rows.remove(i)}>
                      Remove<span className="sr-only"> reading {i + 1}</span>
                    </button>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        {formState.errors.rows?.message || formState.errors.rows?.root?.message || apiFields.readings ? (
          <p className="field-error" role="alert">
            {formState.errors.rows?.message ?? formState.errors.rows?.root?.message ?? apiFields.readings}
          </p>
        ) : null}
        {formState.errors.root?.message || otherServerErrors.length ? (
          <div className="field-error" role="alert">
            {formState.errors.root?.message ? <p>{formState.errors.root.message}</p> : null}
            {otherServerErrors.map(([k, m]) => (
              <p key={k}>
                {ROOT_LABEL[k.split(".")[0] ?? ""] ?? k}: {m}
              </p>
            ))}
          </div>
        ) : null}
        <div className="flex flex-wrap gap-2">
          <button type="submit" className="btn-primary py-1" disabled={fit.isPending}>
            Fit the readings
          </button>
          <button type="button" className="btn-secondary py-1" onClick={() => rows.append({ dialKHz: "", value: "" })}>
            Add a mark
          </button>
          <button
            type="button"
            className="btn-secondary py-1"
            onClick={() => {
              getValues("rows").forEach((_, i) => setValue(`rows.${i}.value`, ""));
              fit.reset();
              clearErrors();
              firstValue.current?.focus();
            }}
          >
            New readings at the same marks
          </button>
          <button
            type="button"
            className="btn-quiet py-1"
            onClick={() => rows.replace(usualMarks(requestBase()).map((d) => ({ dialKHz: d, value: "" })))}
          >
            Usual marks for the band
          </button>
          {sheetRows.length ? (
            <button
              type="button"
              className="btn-quiet py-1"
              onClick={() => {
                setValue("readingKind", "received");
                rows.replace(sheetRows);
              }}
            >
              Use the bench sheet&apos;s readings ({sheetRows.length})
            </button>
          ) : null}
        </div>
      </form>
      {fit.isPending ? <p role="status">Fitting…</p> : null}
      {fit.isError && !(fit.error instanceof ApiError && fit.error.status === 400) ? (
        <Notice tone="error" live>
          {errorText(fit.error)}
        </Notice>
      ) : null}
      {fit.isError && fit.error instanceof ApiError && fit.error.status === 400 ? (
        <Notice tone="error" live title="The fit cannot use these readings">
          {fit.error.message}
        </Notice>
      ) : null}
      {fit.data && !fit.isPending ? <Result r={fit.data} readingKind={getValues("readingKind")} /> : null}
    </section>
  );
}
