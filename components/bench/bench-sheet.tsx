"use client";

// Parses with zod in the browser: its settings (no eval, field words) first.
import "@/lib/client/zod-setup";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useRef, useState } from "react";
import { useForm, useWatch, type Control, type UseFormRegister } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { judgeReading, formatNumber, readingValueProblem, type ReadingRequirement } from "@/lib/engine/verdicts";
import { benchNoteSchema, parseReadingText } from "@/lib/validation/bench";
import { api, ApiError, errorText, retryLostAnswer } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { PerformancePanel } from "./performance-panel";
import { SafetyCautions } from "./safety-cautions";
import type { BenchSheetJson } from "./types";
import { VerdictBadge } from "./verdict-badge";
import { proposedInstrument, READING_PHASE_LABEL, READING_PHASES, type InstrumentKind, type ReadingPhase } from "@/lib/engine/instruments";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDateTime } from "@/lib/engine/dates";

type SheetForm = { readings: { text: string; note: string }[] };
type Requirement = BenchSheetJson["requirements"][number];
type Offered = BenchSheetJson["instruments"][number];

/** The stored reading of a row in the phase being recorded. */
function storedIn(r: Requirement, phase: ReadingPhase) {
  if (phase === "as_returned")
    return r.recordedAt
      ? {
          value: r.value,
          verdict: r.verdict,
          recordedAt: r.recordedAt,
          recordedByName: r.recordedByName,
          instrumentId: r.instrumentId,
          instrumentOverdue: r.instrumentOverdue,
        }
      : null;
  return r.asReceived;
}

// Model first: a narrow select still shows which instrument it is.
const instrumentName = (i: { maker: string; model: string; serial: string }) => `${i.model}, ${i.maker} (${i.serial})`;

// These readings check dial calibration (where the set receives against where the dial points); tracking
// proper is the antenna circuit's peak, set at the antenna trimmer and coil.
const GROUP_TITLE = (code: string): string => {
  if (code.startsWith("align.if.")) return "IF alignment";
  if (code.startsWith("align.tracking.")) return `Dial calibration at the tracking points, band ${Number(code.split(".")[2]) + 1}`;
  if (code.startsWith("align.dial.")) return `Dial calibration at the band edges, band ${Number(code.split(".")[2]) + 1}`;
  if (code === "test.voltages") return "Supply voltage (with the mains voltage at the time)";
  if (code === "test.leakage") return "Leakage current (final hot check)";
  return code;
};

/** The unit a row is typed and shown in: MHz on SW and FM frequency rows, the stored unit otherwise. */
const shownUnit = (r: Pick<ReadingRequirement, "unit" | "entryUnit">): string => r.entryUnit ?? r.unit;
const shown = (r: Pick<ReadingRequirement, "unit" | "entryUnit">, value: number): string =>
  formatNumber(r.entryUnit === "MHz" ? value / 1000 : value, r.entryUnit === "MHz" ? 4 : 3);

/** A reading's message names its row: "Leakage current, plug one way: a current reading is not below zero." */
function namedProblem(label: string, message: string): string {
  return `${label}: ${message.charAt(0).toLowerCase()}${message.slice(1)}`;
}

function nominalText(r: ReadingRequirement): string {
  if (r.nominal === null) return r.tolerance.kind === "recorded" ? "no schematic figure: recorded only" : "";
  if (r.tolerance.kind === "window")
    return `${r.tolerance.reference === "target" ? "target" : "mark"} ${shown(r, r.nominal)} ${shownUnit(r)}`;
  return `schematic ${formatNumber(r.nominal)} ${r.unit}`;
}

function deviationText(r: ReadingRequirement, value: number): string | null {
  const j = judgeReading(r, value);
  if (j.deviation === undefined) return null;
  const sign = j.deviation >= 0 ? "+" : "−";
  return `${sign}${formatNumber(Math.abs(j.deviation))} ${r.unit} (allowed ±${formatNumber(j.allowed ?? 0)})`;
}

function ReadingRow({
  r,
  index,
  control,
  register,
  editable,
  onSave,
  saving,
  serverError,
  inputRef,
  onEnter,
  phase,
  offered,
  instrumentId,
  onInstrument,
  namedElsewhere,
}: {
  r: Requirement;
  index: number;
  control: Control<SheetForm>;
  register: UseFormRegister<SheetForm>;
  editable: boolean;
  onSave: (index: number) => void;
  saving: boolean;
  serverError?: string;
  inputRef: (el: HTMLInputElement | null) => void;
  onEnter: (index: number) => void;
  phase: ReadingPhase;
  offered: Offered[];
  instrumentId: string;
  onInstrument: (id: string) => void;
  namedElsewhere: Map<string, { label: string; calibrationDueOn: string }>;
}) {
  const timeZone = useShopTimeZone();
  const stored = storedIn(r, phase);
  const other = storedIn(r, phase === "as_returned" ? "as_received" : "as_returned");
  const choices = offered.filter((i) => (r.instrumentKinds as readonly string[]).includes(i.kind));
  const chosen = offered.find((i) => i.id === instrumentId) ?? null;
  const storedInstrument = stored?.instrumentId ? (offered.find((i) => i.id === stored.instrumentId) ?? null) : null;
  const storedInstrumentText = stored?.instrumentId
    ? storedInstrument
      ? instrumentName(storedInstrument)
      : (namedElsewhere.get(stored.instrumentId)?.label ?? "an instrument no longer in service")
    : null;
  const text = useWatch({ control, name: `readings.${index}.text` }) ?? "";
  const parsed = parseReadingText(text, r);
  const problem =
    parsed === undefined
      ? `Enter a number${r.unit === "kHz" ? ", with its unit if you like (1.49 MHz, 455 kHz)" : ` in ${r.unit}`}.`
      : parsed === null
        ? null
        : readingValueProblem(r, parsed);
  const live = problem ? "invalid" : judgeReading(r, parsed).verdict;
  // Compared as numbers: "580 kHz" typed and 580 stored are the same reading.
  const dirty =
    parsed === undefined ||
    (parsed ?? null) !== (stored?.value ?? null) ||
    (stored !== null && (stored.instrumentId ?? "") !== instrumentId);
  const id = `rd-${r.key.replaceAll(".", "-")}`;
  const reg = register(`readings.${index}.text`);
  return (
    <tr data-reading={r.key} data-verdict={live}>
      <th scope="row" className="font-normal">
        <label htmlFor={id}>{r.label}</label>
        {nominalText(r) ? <span className="block text-xs text-bakelite-muted figure">{nominalText(r)}</span> : null}
      </th>
      <td>
        <div className="flex items-center gap-1">
          <input
            id={id}
            inputMode="decimal"
            autoComplete="off"
            className="field-input figure mt-0 w-28 py-0.5 text-right"
            disabled={!editable}
            aria-invalid={live === "invalid" || live === "fail" ? true : undefined}
            aria-describedby={`${id}-tol ${id}-verdict${serverError || problem ? ` ${id}-error` : ""}`}
            {...reg}
            ref={(el) => {
              reg.ref(el);
              inputRef(el);
            }}
            onKeyDown={(e) => {
              if (e.key === "Enter") {
                e.preventDefault();
                onSave(index);
                onEnter(index);
              }
            }}
          />
          <span className="figure text-sm">{shownUnit(r)}</span>
        </div>
        <label htmlFor={`${id}-instrument`} className="sr-only">
          Instrument for {r.label}
        </label>
        <select
          id={`${id}-instrument`}
          className="field-input mt-1 w-40 py-0.5 text-xs"
          value={instrumentId}
          disabled={!editable}
          onChange={(e) => onInstrument(e.target.value)}
          aria-describedby={chosen?.overdue ? `${id}-cal` : undefined}
        >
          <option value="">{choices.length ? "Instrument: none named" : "No instrument of this kind in the register"}</option>
          {choices.map((i) => (
            <option key={i.id} value={i.id}>
              {instrumentName(i)}
              {i.overdue ? " — calibration overdue" : ""}
            </option>
          ))}
        </select>
        {chosen?.overdue ? (
          <p id={`${id}-cal`} className="text-xs font-semibold text-fail" data-calibration="overdue">
            <span aria-hidden="true">⚠ </span>Calibration was due {chosen.calibrationDueOn}: the reading will be flagged.
          </p>
        ) : null}
        {other && other.value !== null ? (
          <p className="text-xs text-bakelite-muted" data-other-phase>
            {READING_PHASE_LABEL[phase === "as_returned" ? "as_received" : "as_returned"]}:{" "}
            <span className="figure">
              {shown(r, other.value)} {shownUnit(r)}
            </span>
          </p>
        ) : null}
        {serverError || (problem && text.trim() !== "") ? (
          <p id={`${id}-error`} className="field-error">
            {namedProblem(r.label, (serverError ?? problem)!)}
          </p>
        ) : null}
      </td>
      <td id={`${id}-tol`} className="text-xs">
        {r.toleranceText} <span className="figure">({r.unit})</span>
      </td>
      <td aria-live="polite">
        <VerdictBadge verdict={live} id={`${id}-verdict`} />
        {parsed !== null && parsed !== undefined && !problem ? (
          <span className="ml-1 figure text-xs text-bakelite-muted">{deviationText(r, parsed)}</span>
        ) : null}
      </td>
      <td className="text-xs text-bakelite-muted">
        {saving ? (
          "Saving…"
        ) : dirty ? (
          <button type="button" className="btn-quiet px-1 py-0 text-xs" onClick={() => onSave(index)} disabled={!editable}>
            Save<span className="sr-only"> {r.label}</span>
          </button>
        ) : stored ? (
          <span>
            Saved{stored.recordedByName ? ` by ${stored.recordedByName}` : ""},{" "}
            {formatDateTime(stored.recordedAt, { timeZone, style: "compact" })}
            {storedInstrumentText ? <span className="block">with {storedInstrumentText}</span> : null}
            {stored.instrumentOverdue ? (
              <span className="block font-semibold text-fail" data-flag="calibration-overdue">
                <span aria-hidden="true">⚠ </span>Taken with an instrument past its calibration due date
              </span>
            ) : null}
          </span>
        ) : (
          "—"
        )}
      </td>
    </tr>
  );
}

function Readings({ sheet, jobId, phase }: { sheet: BenchSheetJson; jobId: string; phase: ReadingPhase }) {
  const qc = useQueryClient();
  const form = useForm<SheetForm>({
    defaultValues: {
      readings: sheet.requirements.map((r) => {
        const v = storedIn(r, phase)?.value ?? null;
        return { text: v === null ? "" : shown(r, v), note: r.note ?? "" };
      }),
    },
  });
  // The instrument per row: what the technician picked here, else the one the stored reading names, else
  // their last choice for the row's kind (kept on the server per technician, updated here at once).
  const [picked, setPicked] = useState<Record<number, string>>({});
  const [recent, setRecent] = useState<Partial<Record<InstrumentKind, string>>>({});
  const offered = sheet.instruments;
  const namedElsewhere = new Map(sheet.retiredInstruments.map((i) => [i.id, i]));
  const instrumentFor = (r: Requirement, i: number): string => {
    if (i in picked) return picked[i]!;
    const stored = storedIn(r, phase);
    if (stored?.instrumentId) return offered.some((o) => o.id === stored.instrumentId) ? stored.instrumentId : "";
    return proposedInstrument(r.instrumentKinds, { ...sheet.lastChoices, ...recent }, offered) ?? "";
  };
  const pick = (i: number, id: string) => {
    setPicked((p) => ({ ...p, [i]: id }));
    const kind = offered.find((o) => o.id === id)?.kind;
    if (kind) setRecent((x) => ({ ...x, [kind]: id }));
  };
  const inputs = useRef<(HTMLInputElement | null)[]>([]);
  const [pending, setPending] = useState<Set<number>>(new Set());
  const [errors, setErrors] = useState<Record<number, string>>({});
  const save = useMutation({
    mutationFn: (body: { key: string; value: number | null; phase: ReadingPhase; instrumentId: string | null }) =>
      api(`/api/bench/jobs/${jobId}/readings`, { method: "POST", body }),
    onSettled: () => void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) }),
  });
  const saveRow = (i: number) => {
    const r = sheet.requirements[i]!;
    const value = parseReadingText(form.getValues(`readings.${i}.text`) ?? "", r);
    if (value === undefined) {
      setErrors((e) => ({ ...e, [i]: "Enter a number, e.g. 455, 1.49 MHz or 0.21." }));
      return;
    }
    const problem = value === null ? null : readingValueProblem(r, value);
    if (problem) {
      setErrors((e) => ({ ...e, [i]: problem }));
      return;
    }
    setErrors((e) => {
      const { [i]: _drop, ...rest } = e;
      return rest;
    });
    setPending((p) => new Set(p).add(i));
    save.mutate(
      { key: r.key, value, phase, instrumentId: instrumentFor(r, i) || null },
      {
        onError: (e) =>
          setErrors((x) => ({ ...x, [i]: e instanceof ApiError ? (e.fields.value ?? e.fields.instrumentId ?? e.message) : errorText(e) })),
        onSettled: () =>
          setPending((p) => {
            const n = new Set(p);
            n.delete(i);
            return n;
          }),
      },
    );
  };
  const focusNext = (i: number) => inputs.current[i + 1]?.focus();

  const groups: { code: string; items: { r: Requirement; i: number }[] }[] = [];
  sheet.requirements.forEach((r, i) => {
    const g = groups.find((x) => x.code === r.lineCode);
    if (g) g.items.push({ r, i });
    else groups.push({ code: r.lineCode, items: [{ r, i }] });
  });

  return (
    <section aria-labelledby="readings-heading" className="card overflow-x-auto p-3">
      <h3 id="readings-heading" className="text-lg font-semibold">
        Readings
      </h3>
      <p className="text-xs text-bakelite-muted">
        Type a reading and press Enter to save it and move to the next; the verdict follows as you type. Frequencies take a unit (1.49 MHz,
        455 kHz, 455k); SW and FM rows are in MHz. Each row takes the instrument it was measured with; your last choice of each kind is
        proposed on the next row.
      </p>
      <table className="dense-table mt-2">
        <thead>
          <tr>
            <th scope="col">Reading</th>
            <th scope="col">Value</th>
            <th scope="col">Tolerance</th>
            <th scope="col">Verdict</th>
            <th scope="col">Saved</th>
          </tr>
        </thead>
        {groups.map((g) => (
          <tbody key={g.code}>
            <tr>
              <th colSpan={5} scope="colgroup" className="bg-dial-deep text-left text-xs uppercase tracking-wide">
                {GROUP_TITLE(g.code)}
              </th>
            </tr>
            {g.items.map(({ r, i }) => (
              <ReadingRow
                key={r.key}
                r={r}
                index={i}
                control={form.control}
                register={form.register}
                editable={sheet.editable}
                onSave={saveRow}
                saving={pending.has(i)}
                serverError={errors[i]}
                inputRef={(el) => {
                  inputs.current[i] = el;
                }}
                onEnter={focusNext}
                phase={phase}
                offered={offered}
                instrumentId={instrumentFor(r, i)}
                onInstrument={(id) => pick(i, id)}
                namedElsewhere={namedElsewhere}
              />
            ))}
          </tbody>
        ))}
      </table>
      {groups.some((g) => g.code.startsWith("align.dial.") || g.code.startsWith("align.tracking.")) ? (
        <p className="mt-2 text-xs text-bakelite-muted" data-testid="dial-fit-hint">
          Dial out of tolerance? On the Alignment tab the dial-calibration fit takes these band-edge and tracking readings and says which
          adjustment to turn, which way and about how far.
        </p>
      ) : null}
    </section>
  );
}

function Tasks({ sheet, jobId }: { sheet: BenchSheetJson; jobId: string }) {
  const timeZone = useShopTimeZone();
  const qc = useQueryClient();
  const tickKey = [...benchKeys.sheet(jobId), "tick"];
  // A tick shows at once (local state); the server's answer then lands in the sheet, or the tick is taken back.
  const [local, setLocal] = useState<Record<string, boolean>>({});
  const [error, setError] = useState<string | null>(null);
  const forget = (code: string) =>
    setLocal((l) => {
      const { [code]: _gone, ...rest } = l;
      return rest;
    });
  const tick = useMutation({
    mutationKey: tickKey,
    mutationFn: (body: { code: string; done: boolean }) =>
      api<{ code: string; done: boolean; doneAt: string | null }>(`/api/bench/jobs/${jobId}/tasks`, { method: "POST", body }),
    onSuccess: (res) => {
      qc.setQueryData<BenchSheetJson>(benchKeys.sheet(jobId), (old) =>
        old
          ? {
              ...old,
              tasks: old.tasks.map((t) =>
                t.code === res.code ? { ...t, doneAt: res.doneAt, doneByName: res.done ? t.doneByName : null } : t,
              ),
            }
          : old,
      );
      forget(res.code);
      setError(null);
    },
    onError: (e, body) => {
      forget(body.code);
      setError(errorText(e));
    },
    // Several quick ticks: refetch (names, the completion gate) once the last one is in.
    onSettled: () => {
      if (qc.isMutating({ mutationKey: tickKey }) === 1) void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) });
    },
  });
  const isDone = (t: BenchSheetJson["tasks"][number]) => local[t.code] ?? Boolean(t.doneAt);
  const done = sheet.tasks.filter(isDone).length;
  return (
    <section aria-labelledby="tasks-heading" className="card p-3">
      <h3 id="tasks-heading" className="text-lg font-semibold">
        Checklist{" "}
        <span className="figure text-sm font-normal">
          ({done} of {sheet.tasks.length} done)
        </span>
      </h3>
      {sheet.tasks.length === 0 ? (
        <p className="text-sm text-bakelite-muted">No checklist yet: it comes from the estimate once sent.</p>
      ) : null}
      <ul className="mt-1 space-y-0.5 text-sm">
        {sheet.tasks.map((t) => (
          <li key={t.code} data-task={t.code}>
            <label className="inline-flex items-start gap-2">
              <input
                type="checkbox"
                className="mt-1"
                checked={isDone(t)}
                disabled={!sheet.editable}
                onChange={(e) => {
                  const value = e.target.checked;
                  setLocal((l) => ({ ...l, [t.code]: value }));
                  tick.mutate({ code: t.code, done: value });
                }}
              />
              <span>
                {t.title}
                <span className="block text-xs text-bakelite-muted">
                  {t.code in local
                    ? "Saving…"
                    : t.doneAt
                      ? `✓ Done by ${t.doneByName ?? "you"}, ${formatDateTime(t.doneAt, { timeZone, style: "compact" })}`
                      : "○ Open"}
                </span>
              </span>
            </label>
          </li>
        ))}
      </ul>
      {error ? (
        <p className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </section>
  );
}

function BenchNote({ jobId }: { jobId: string }) {
  const qc = useQueryClient();
  const [body, setBody] = useState("");
  const [error, setError] = useState<string | null>(null);
  // One key per note: kept while it is retried, so a lost answer never stores it twice; renewed once stored.
  const [idempotencyKey, setIdempotencyKey] = useState(() => crypto.randomUUID());
  const m = useMutation({
    mutationFn: (note: { body: string; idempotencyKey: string }) => api(`/api/bench/jobs/${jobId}/notes`, { method: "POST", body: note }),
    retry: retryLostAnswer,
    onSuccess: () => {
      setBody("");
      setIdempotencyKey(crypto.randomUUID());
      void qc.invalidateQueries({ queryKey: benchKeys.job(jobId) });
      void qc.invalidateQueries({ queryKey: benchKeys.messages(jobId) });
    },
    onError: (e) => {
      // Another text under a key that already stored a note: the next try is a note of its own.
      if (e instanceof ApiError && e.fields.idempotencyKey) {
        setIdempotencyKey(crypto.randomUUID());
        void qc.invalidateQueries({ queryKey: benchKeys.job(jobId) });
      }
      setError(errorText(e));
    },
  });
  return (
    <form
      noValidate
      className="card space-y-2 p-3"
      onSubmit={(e) => {
        e.preventDefault();
        const parsed = benchNoteSchema.safeParse({ body, idempotencyKey });
        if (!parsed.success) return setError(parsed.error.issues[0]?.message ?? "Note: write the note first.");
        setError(null);
        m.mutate(parsed.data);
      }}
    >
      <Field id="bench-note" label="Bench note (workshop only)" error={error ?? undefined}>
        <textarea
          id="bench-note"
          rows={2}
          className="field-input"
          value={body}
          onChange={(e) => setBody(e.target.value)}
          aria-describedby={describedBy("bench-note", { error })}
        />
      </Field>
      <button type="submit" className="btn-secondary py-1" disabled={m.isPending}>
        Add note
      </button>
    </form>
  );
}

/** As received or as returned: proposed from the job's state, switched by the technician for this visit. */
function PhaseChoice({
  phase,
  proposed,
  onChange,
  disabled,
}: {
  phase: ReadingPhase;
  proposed: ReadingPhase;
  onChange: (p: ReadingPhase) => void;
  disabled: boolean;
}) {
  return (
    <fieldset className="card flex flex-wrap items-center gap-x-4 gap-y-1 p-2 text-sm" data-phase={phase}>
      <legend className="sr-only">Readings are recorded</legend>
      <span className="font-semibold" aria-hidden="true">
        Recording:
      </span>
      {READING_PHASES.map((p) => (
        <label key={p} className="inline-flex items-center gap-1">
          <input type="radio" name="reading-phase" value={p} checked={phase === p} disabled={disabled} onChange={() => onChange(p)} />
          {READING_PHASE_LABEL[p]}
        </label>
      ))}
      <span className="text-xs text-bakelite-muted">
        {phase === "as_received"
          ? "The set as it came in, before any work. Verdicts for completion come from the as-returned readings."
          : "The set as it goes back: these readings decide completion and print on the certificate."}
        {phase !== proposed ? ` Proposed for this job: ${READING_PHASE_LABEL[proposed].toLowerCase()}.` : ""}
      </span>
    </fieldset>
  );
}

export function BenchSheetPanel({ jobId }: { jobId: string }) {
  const q = useQuery({ queryKey: benchKeys.sheet(jobId), queryFn: () => api<BenchSheetJson>(`/api/bench/jobs/${jobId}/sheet`) });
  const [chosenPhase, setPhase] = useState<ReadingPhase | null>(null);
  // The phase proposed when the sheet opened stays put while the technician works (a first tick would
  // otherwise flip the sheet under their hands); switching is theirs.
  const [openedWith, setOpenedWith] = useState<ReadingPhase | null>(null);
  if (q.data && openedWith === null) setOpenedWith(q.data.defaultPhase);
  if (q.isPending) return <p role="status">Loading the bench sheet…</p>;
  if (q.isError) return <Notice tone="error">{errorText(q.error)}</Notice>;
  const sheet = q.data;
  const phase = chosenPhase ?? openedWith ?? sheet.defaultPhase;
  if (!sheet.profile)
    return <Notice tone="caution">The set profile is incomplete: finish it in Triage before the bench sheet can list its readings.</Notice>;
  return (
    <div className="space-y-3">
      <SafetyCautions profile={sheet.profile} />
      {!sheet.editable ? (
        <Notice tone="info">Readings and ticks are recorded while the set is on the bench or in final checks.</Notice>
      ) : null}
      <div className="grid gap-3 xl:grid-cols-[2fr_1fr]">
        {/* min-w-0: the readings card scrolls inside itself instead of widening the grid on a phone. */}
        <div className="min-w-0 space-y-2">
          <PhaseChoice phase={phase} proposed={sheet.defaultPhase} onChange={setPhase} disabled={!sheet.editable} />
          <Readings key={`${phase}:${sheet.requirements.map((r) => r.key).join("|")}`} sheet={sheet} jobId={jobId} phase={phase} />
        </div>
        <div className="space-y-3">
          <Tasks sheet={sheet} jobId={jobId} />
          <BenchNote jobId={jobId} />
        </div>
      </div>
      <PerformancePanel sheet={sheet} jobId={jobId} />
    </div>
  );
}
