"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useFieldArray, useForm, useWatch, type FieldPath } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { billingNote } from "@/lib/engine/pricing/billing-note";
import { formatMinor } from "@/lib/engine/pricing/money";
import type { ShopPolicy } from "@/lib/engine/shop-policy";
import {
  CATEGORY_LABEL,
  DRAFT_CATEGORIES,
  draftSchema,
  moneyText,
  tryPriceDraft,
  type Draft,
  type DraftLineInput,
} from "@/lib/validation/estimate";
import { api, ApiError, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import type { EstimateViewJson } from "./types";
import type { PartSearchHit } from "@/lib/server/services/parts";
import { PartSearch, stockWords } from "./part-search";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDateTime } from "@/lib/engine/dates";

type FormValues = { lines: DraftLineInput[] };

const STATUS_WORDS: Record<string, string> = {
  sent: "✎ Sent, awaiting the owner",
  approved: "✓ Approved",
  declined: "✕ Declined",
  superseded: "↺ Replaced by a later revision",
};

function fetchEstimate(jobId: string) {
  return api<EstimateViewJson>(`/api/bench/jobs/${jobId}/estimate`);
}

let keyCounter = 0;
const newKey = () => `new-${Date.now().toString(36)}-${(keyCounter++).toString(36)}`;

function Totals({ policy, lines }: { policy: ShopPolicy; lines: DraftLineInput[] }) {
  const parsed = draftSchema.safeParse({ lines });
  const result = parsed.success ? tryPriceDraft(parsed.data.lines, policy) : null;
  const c = policy.currency;
  const m = (n: number) => moneyText(n, c.code, c.exponent);
  if (!result || !result.ok) {
    return (
      <div role="status" aria-live="polite" className="text-sm text-fail">
        <span aria-hidden="true">! </span>
        {result && !result.ok ? result.message : "Some lines need attention before the totals can be worked out."}
      </div>
    );
  }
  const t = result.priced.totals;
  return (
    <>
      <dl
        role="status"
        aria-live="polite"
        aria-label="Estimate totals"
        className="grid grid-cols-2 gap-x-4 gap-y-0.5 text-sm sm:grid-cols-4 lg:grid-cols-8"
      >
        {(
          [
            ["Labour", t.labourMinor, `billed as ${t.billedMinutes} min`],
            ["Parts", t.partsMinor, null],
            ["Tax on labour", t.labourTaxMinor, `${policy.tax.labourBp / 100} %`],
            ["Tax on parts", t.partsTaxMinor, `${policy.tax.partsBp / 100} %`],
            ["Tax", t.taxMinor, null],
            ["Total", t.totalMinor, null],
            ["Deposit due", t.depositMinor, `${policy.deposit.percentBp / 100} %${policy.deposit.atLeastParts ? ", at least parts" : ""}`],
            ["Balance after deposit", t.balanceMinor, null],
          ] as const
        ).map(([label, value, hint]) => (
          <div key={label}>
            <dt className="text-xs text-bakelite-muted">{label}</dt>
            <dd className="figure font-semibold" data-total={label}>
              {m(value)}
              {hint ? <span className="block text-xs font-normal text-bakelite-muted">{hint}</span> : null}
            </dd>
          </div>
        ))}
      </dl>
      <p className="text-xs text-bakelite-muted" data-testid="billing-note">
        {billingNote(t)}
        {t.roundingLabourMinor ? ` Rounding adds ${m(t.roundingLabourMinor)} to the labour, on no single line.` : ""}
      </p>
    </>
  );
}

function LineFigures({ policy, lines, index }: { policy: ShopPolicy; lines: DraftLineInput[]; index: number }) {
  const parsed = draftSchema.safeParse({ lines });
  const result = parsed.success ? tryPriceDraft(parsed.data.lines, policy) : null;
  const line = result && result.ok ? result.priced.lines[index] : undefined;
  const c = policy.currency;
  return (
    <>
      <td className="figure text-right">{line ? moneyText(line.labourMinor, c.code, c.exponent) : "—"}</td>
      <td className="figure text-right">{line ? moneyText(line.partsMinor, c.code, c.exponent) : "—"}</td>
    </>
  );
}

function Builder({ view, onReload }: { view: EstimateViewJson; onReload: () => void }) {
  const timeZone = useShopTimeZone();
  const jobId = view.jobId;
  const qc = useQueryClient();
  const policy = view.policy;
  const [baseVersion, setBaseVersion] = useState(view.version);
  const [stale, setStale] = useState<string | null>(null);
  const [notice, setNotice] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const [changeSummary, setChangeSummary] = useState("");
  const [summaryError, setSummaryError] = useState<string | null>(null);
  // Stock of the catalogue parts on the lines: as the view loaded it, then as each search answered.
  const [stockOf, setStockOf] = useState<Record<string, { name: string; stock: number | null; retired: boolean }>>(view.partsInStock);
  const form = useForm<FormValues, unknown, Draft>({ resolver: zodResolver(draftSchema), defaultValues: { lines: view.lines } });
  const { register, control, handleSubmit, formState, setError } = form;
  const lines = useFieldArray({ control, name: "lines", keyName: "fieldKey" });
  const watched = useWatch({ control, name: "lines" }) ?? [];
  const editable = view.editable;

  const applyServerFields = (e: unknown) => {
    if (e instanceof ApiError)
      for (const [k, msg] of Object.entries(e.fields)) if (k.startsWith("lines.")) setError(k as FieldPath<FormValues>, { message: msg });
  };

  const save = useMutation({
    mutationFn: ({ version, draft }: { version: number; draft: Draft }) =>
      api<{ version: number }>(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", body: { version, lines: draft.lines } }),
    onSuccess: (res, { draft }) => {
      setBaseVersion(res.version);
      setStale(null);
      form.reset({ lines: draft.lines }, { keepDefaultValues: false });
      setNotice({ tone: "success", text: `Saved (version ${res.version}).` });
      void qc.invalidateQueries({ queryKey: benchKeys.estimate(jobId) });
    },
    onError: (e) => {
      if (e instanceof ApiError && e.code === "stale") setStale(e.message);
      else setNotice({ tone: "error", text: errorText(e) });
      applyServerFields(e);
    },
  });

  const send = useMutation({
    mutationFn: async () => {
      let version = baseVersion;
      if (formState.isDirty || !view.saved) {
        const draft = await new Promise<Draft | null>(
          (resolve) =>
            void handleSubmit(
              (d) => resolve(d),
              () => resolve(null),
            )(),
        );
        if (!draft) throw new ApiError(400, "invalid_input", "Some lines need attention before the estimate can be sent.");
        const res = await save.mutateAsync({ version, draft });
        version = res.version;
      }
      return api<{ revision: number }>(`/api/bench/jobs/${jobId}/estimate/send`, {
        method: "POST",
        body: { version, changeSummary: changeSummary.trim() || undefined },
      });
    },
    onSuccess: (res) => {
      setChangeSummary("");
      setSummaryError(null);
      setNotice({ tone: "success", text: `Revision ${res.revision} sent to the owner.` });
      void qc.invalidateQueries({ queryKey: benchKeys.estimate(jobId) });
      void qc.invalidateQueries({ queryKey: benchKeys.job(jobId) });
      void qc.invalidateQueries({ queryKey: benchKeys.queues() });
      void qc.invalidateQueries({ queryKey: benchKeys.sheet(jobId) });
    },
    onError: (e) => {
      if (e instanceof ApiError && e.fields.changeSummary) setSummaryError(e.fields.changeSummary);
      if (e instanceof ApiError && e.code === "stale") setStale(e.message);
      else setNotice({ tone: "error", text: errorText(e) });
    },
  });

  const rebuild = useMutation({
    mutationFn: () =>
      api<{ version: number }>(`/api/bench/jobs/${jobId}/estimate/rebuild`, { method: "POST", body: { version: baseVersion } }),
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: benchKeys.estimate(jobId) });
      onReload();
    },
    onError: (e) => {
      if (e instanceof ApiError && e.code === "stale") setStale(e.message);
      else setNotice({ tone: "error", text: errorText(e) });
    },
  });

  const saveOverTheirs = async () => {
    const fresh = await qc.fetchQuery({ queryKey: benchKeys.estimate(jobId), queryFn: () => fetchEstimate(jobId), staleTime: 0 });
    void handleSubmit((draft) => save.mutate({ version: fresh.version, draft }))();
  };

  const addLabour = () => {
    const n = watched.filter((l) => l.code.startsWith("custom.")).length + 1;
    let code = `custom.${n}`;
    for (let k = n + 1; watched.some((l) => l.code === code); k++) code = `custom.${k}`;
    lines.append({
      key: newKey(),
      kind: "labour",
      code,
      title: "",
      category: "mechanical",
      minutes: 15,
      quantity: 1,
      reason: "",
      readings: [],
      unitCost: "",
      markupPercent: "",
      covered: view.isWarranty,
    });
  };
  const appendPart = (hit: PartSearchHit | null) => {
    const base = hit ? (hit.code ? `part.${hit.code}` : `part.c-${hit.id.slice(0, 8)}`) : "part.other";
    let code = base;
    for (let k = 2; watched.some((l) => l.code === code); k++) code = `${base}.${k}`;
    if (hit) setStockOf((s) => ({ ...s, [hit.id]: { name: hit.name, stock: hit.stock, retired: false } }));
    lines.append({
      key: newKey(),
      kind: "part",
      code,
      title: hit?.name ?? "",
      category: "parts",
      minutes: 0,
      quantity: 1,
      reason: "",
      readings: [],
      // The price the catalogue gives today, kept on the line: a later catalogue edit leaves it as it is.
      unitCost: hit ? formatMinor(hit.costMinor, policy.currency.exponent) : "",
      markupPercent: String((hit?.effectiveMarkupBp ?? policy.parts.defaultMarkupBp) / 100),
      covered: view.isWarranty,
      ...(hit ? { partId: hit.id } : {}),
    });
  };
  // How many of each counted part the lines ask for, against the count: a warning, never a refusal.
  const askedFor = new Map<string, number>();
  for (const l of watched)
    if (l.kind === "part" && l.partId) askedFor.set(l.partId, (askedFor.get(l.partId) ?? 0) + (Number(l.quantity) || 0));
  const stockNote = (partId: string | undefined): string | null => {
    if (!partId) return null;
    const s = stockOf[partId];
    if (!s) return null;
    const notes: string[] = [];
    if (s.retired) notes.push("Retired from the catalogue since; the line keeps its price.");
    const asked = askedFor.get(partId) ?? 0;
    if (s.stock !== null && asked > s.stock)
      notes.push(
        `Only ${Math.max(0, s.stock)} in stock and the estimate asks for ${asked}: order more before the work (it can still be sent).`,
      );
    return notes.length ? notes.join(" ") : null;
  };

  const lineErrors = formState.errors.lines;
  const errorOf = (i: number, name: keyof DraftLineInput): string | undefined => {
    const e = lineErrors?.[i]?.[name];
    return e && typeof e === "object" && "message" in e ? (e.message as string | undefined) : undefined;
  };

  return (
    <form
      noValidate
      aria-labelledby="estimate-heading"
      className="space-y-3"
      onSubmit={handleSubmit((draft) => {
        setNotice(null);
        save.mutate({ version: baseVersion, draft });
      })}
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 id="estimate-heading" className="text-lg font-semibold">
          Estimate builder
        </h3>
        <p className="text-xs text-bakelite-muted">
          {view.saved
            ? `Draft version ${baseVersion}${view.updatedByName ? `, last saved by ${view.updatedByName}` : ""}`
            : "Computed from the checklist — not saved yet"}
          {view.currentRevision ? ` · revision ${view.currentRevision} is the latest sent` : ""}
        </p>
      </div>

      {view.profileIssues ? (
        <Notice tone="caution" title="The set profile needs attention">
          <p>The checklist cannot be computed until the profile is complete (see Triage).</p>
          <ul className="list-disc pl-5">
            {/* Each message names its field; the field's path stays in the data. */}
            {Object.entries(view.profileIssues).map(([k, v]) => (
              <li key={k} data-field={k}>
                {v}
              </li>
            ))}
          </ul>
        </Notice>
      ) : null}

      {stale ? (
        <Notice tone="error" title="Someone else saved this estimate" live>
          <p>{stale}</p>
          <div className="flex flex-wrap gap-2 pt-1">
            <button type="button" className="btn-secondary py-1" onClick={onReload}>
              Load the saved version (discard my changes)
            </button>
            <button type="button" className="btn-primary py-1" onClick={() => void saveOverTheirs()}>
              Save mine over it
            </button>
          </div>
        </Notice>
      ) : null}

      <div className="card sticky top-0 z-10 p-2">
        <Totals policy={policy} lines={watched} />
      </div>

      <div className="card overflow-x-auto">
        <table className="dense-table" aria-label="Estimate lines">
          <thead>
            <tr>
              <th scope="col">#</th>
              <th scope="col">Line and reason</th>
              <th scope="col">Category</th>
              <th scope="col">Minutes / unit cost</th>
              <th scope="col">Qty</th>
              <th scope="col">Markup %</th>
              {view.isWarranty ? <th scope="col">Covered</th> : null}
              <th scope="col" className="text-right">
                Labour
              </th>
              <th scope="col" className="text-right">
                Parts
              </th>
              <th scope="col">
                <span className="sr-only">Move or remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {lines.fields.map((f, i) => {
              const line = watched[i] ?? f;
              const part = line.kind === "part";
              const idp = `est-${i}`;
              const titleErr = errorOf(i, "title");
              const numErr = part ? errorOf(i, "unitCost") : errorOf(i, "minutes");
              const qtyErr = errorOf(i, "quantity");
              const mkErr = errorOf(i, "markupPercent");
              return (
                <tr key={f.fieldKey} data-line={line.code}>
                  <td className="figure text-bakelite-muted">{i + 1}</td>
                  <td className="min-w-[18rem]">
                    <label htmlFor={`${idp}-title`} className="sr-only">
                      Line {i + 1} title
                    </label>
                    <input
                      id={`${idp}-title`}
                      className="field-input mt-0 py-0.5 text-sm font-semibold"
                      disabled={!editable}
                      aria-invalid={titleErr ? true : undefined}
                      aria-describedby={titleErr ? `${idp}-title-error` : `${idp}-reason`}
                      {...register(`lines.${i}.title`)}
                    />
                    {titleErr ? (
                      <p id={`${idp}-title-error`} className="field-error">
                        {titleErr}
                      </p>
                    ) : null}
                    {/* The line's code stays in the data (data-line); people read its reason and readings. */}
                    <p id={`${idp}-reason`} className="mt-0.5 text-xs text-bakelite-muted">
                      {line.reason || (part ? "Part" : "Labour")}
                    </p>
                    {part && stockNote(line.partId) ? (
                      <p className="mt-0.5 text-xs font-semibold text-ember-dark" data-stock-warning={line.partId}>
                        <span aria-hidden="true">⚠ </span>
                        {stockNote(line.partId)}
                      </p>
                    ) : part && line.partId && stockOf[line.partId] ? (
                      <p className="text-xs text-bakelite-muted">{stockWords(stockOf[line.partId]!.stock)}</p>
                    ) : null}
                    {line.readings.length ? (
                      <p className="text-xs text-bakelite-muted">
                        Readings: {line.readings.map((k) => view.readingLabels[k] ?? "a bench-sheet reading").join("; ")}
                      </p>
                    ) : null}
                  </td>
                  <td>
                    <label htmlFor={`${idp}-cat`} className="sr-only">
                      Line {i + 1} category
                    </label>
                    <select
                      id={`${idp}-cat`}
                      className="rounded border border-bakelite-muted bg-white px-1 py-0.5 text-sm"
                      disabled={!editable || part}
                      {...register(`lines.${i}.category`)}
                    >
                      {DRAFT_CATEGORIES.map((c) => (
                        <option key={c} value={c}>
                          {CATEGORY_LABEL[c]}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td>
                    <label htmlFor={`${idp}-num`} className="sr-only">
                      {part ? `Line ${i + 1} unit cost, ${policy.currency.code}` : `Line ${i + 1} minutes per unit`}
                    </label>
                    <div className="flex items-center gap-1">
                      <input
                        id={`${idp}-num`}
                        inputMode="decimal"
                        className="field-input figure mt-0 w-20 py-0.5 text-right text-sm"
                        disabled={!editable}
                        aria-invalid={numErr ? true : undefined}
                        aria-describedby={numErr ? `${idp}-num-error` : undefined}
                        {...register(part ? `lines.${i}.unitCost` : `lines.${i}.minutes`)}
                      />
                      <span className="text-xs text-bakelite-muted">{part ? policy.currency.code : "min"}</span>
                    </div>
                    {numErr ? (
                      <p id={`${idp}-num-error`} className="field-error">
                        {numErr}
                      </p>
                    ) : null}
                  </td>
                  <td>
                    <label htmlFor={`${idp}-qty`} className="sr-only">
                      Line {i + 1} quantity
                    </label>
                    <input
                      id={`${idp}-qty`}
                      inputMode="numeric"
                      className="field-input figure mt-0 w-14 py-0.5 text-right text-sm"
                      disabled={!editable}
                      aria-invalid={qtyErr ? true : undefined}
                      aria-describedby={qtyErr ? `${idp}-qty-error` : undefined}
                      {...register(`lines.${i}.quantity`)}
                    />
                    {qtyErr ? (
                      <p id={`${idp}-qty-error`} className="field-error">
                        {qtyErr}
                      </p>
                    ) : null}
                  </td>
                  <td>
                    {part ? (
                      <>
                        <label htmlFor={`${idp}-mk`} className="sr-only">
                          Line {i + 1} markup, percent
                        </label>
                        <input
                          id={`${idp}-mk`}
                          inputMode="decimal"
                          className="field-input figure mt-0 w-14 py-0.5 text-right text-sm"
                          disabled={!editable}
                          aria-invalid={mkErr ? true : undefined}
                          aria-describedby={mkErr ? `${idp}-mk-error` : undefined}
                          {...register(`lines.${i}.markupPercent`)}
                        />
                        {mkErr ? (
                          <p id={`${idp}-mk-error`} className="field-error">
                            {mkErr}
                          </p>
                        ) : null}
                      </>
                    ) : (
                      <span className="text-bakelite-muted">—</span>
                    )}
                  </td>
                  {view.isWarranty ? (
                    <td>
                      <label className="inline-flex items-center gap-1 text-xs">
                        <input type="checkbox" disabled={!editable} {...register(`lines.${i}.covered`)} />
                        No charge<span className="sr-only"> for line {i + 1}</span>
                      </label>
                    </td>
                  ) : null}
                  <LineFigures policy={policy} lines={watched} index={i} />
                  <td className="whitespace-nowrap">
                    <button
                      type="button"
                      className="btn-quiet px-1 py-0"
                      disabled={!editable || i === 0}
                      onClick={() => lines.move(i, i - 1)}
                      aria-label={`Move line ${i + 1} up`}
                    >
                      ↑
                    </button>
                    <button
                      type="button"
                      className="btn-quiet px-1 py-0"
                      disabled={!editable || i === lines.fields.length - 1}
                      onClick={() => lines.move(i, i + 1)}
                      aria-label={`Move line ${i + 1} down`}
                    >
                      ↓
                    </button>
                    <button
                      type="button"
                      className="btn-quiet px-1 py-0 text-fail"
                      disabled={!editable}
                      onClick={() => lines.remove(i)}
                      aria-label={`Remove line ${i + 1}${line.title ? `: ${line.title}` : ""}`}
                    >
                      ✕
                    </button>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {typeof lineErrors?.root?.message === "string" || typeof lineErrors?.message === "string" ? (
        <p className="field-error">{lineErrors?.root?.message ?? lineErrors?.message}</p>
      ) : null}

      {editable ? (
        <div className="flex flex-wrap items-end gap-2">
          <button type="button" className="btn-secondary py-1" onClick={addLabour}>
            + Labour line
          </button>
          <PartSearch currency={policy.currency} onPick={appendPart} />
          <button type="button" className="btn-secondary py-1" onClick={() => appendPart(null)}>
            + Part of its own (own cost)
          </button>
          <button
            type="button"
            className="btn-quiet py-1"
            onClick={() => rebuild.mutate()}
            disabled={rebuild.isPending || Boolean(view.profileIssues)}
          >
            Rebuild from the checklist
          </button>
        </div>
      ) : (
        <Notice tone="info">This job is past the point where its estimate can change.</Notice>
      )}

      {notice ? (
        <Notice tone={notice.tone} live>
          {notice.text}
        </Notice>
      ) : null}

      {editable ? (
        <div className="card grid gap-3 p-3 md:grid-cols-[1fr_auto]">
          <div className="flex items-start gap-3">
            <button type="submit" className="btn-secondary" disabled={save.isPending}>
              {save.isPending ? "Saving…" : "Save draft"}
            </button>
            <p className="text-xs text-bakelite-muted">
              Enter in any field saves. {formState.isDirty ? "Unsaved changes." : "No unsaved changes."}
            </p>
          </div>
          {view.sendable ? (
            <div className="space-y-2">
              {view.revisions.length ? (
                <Field
                  id="est-summary"
                  label="What changed since the last revision"
                  error={summaryError ?? undefined}
                  hint="The owner reads this in the e-mail; they must approve the new revision."
                >
                  <textarea
                    id="est-summary"
                    rows={2}
                    className="field-input w-96 max-w-full"
                    value={changeSummary}
                    onChange={(e) => setChangeSummary(e.target.value)}
                    aria-invalid={summaryError ? true : undefined}
                    aria-describedby={describedBy("est-summary", { error: summaryError, hint: true })}
                  />
                </Field>
              ) : null}
              <button
                type="button"
                className="btn-primary"
                onClick={() => send.mutate()}
                disabled={send.isPending || Boolean(view.profileIssues) || watched.length === 0}
              >
                {send.isPending
                  ? "Sending…"
                  : view.revisions.length
                    ? `Send revision ${view.revisions.length + 1} to the owner`
                    : "Send estimate to the owner"}
              </button>
            </div>
          ) : (
            <p className="text-sm text-bakelite-muted">The estimate can be sent from triage, after approval, or from the bench.</p>
          )}
        </div>
      ) : null}

      {view.revisions.length ? (
        <section aria-labelledby="revisions-heading" className="card p-3">
          <h4 id="revisions-heading" className="font-semibold">
            Revisions sent
          </h4>
          {/* On a phone the six columns scroll inside the card, not the page. */}
          <div className="overflow-x-auto">
            <table className="dense-table">
              <thead>
                <tr>
                  <th scope="col">Revision</th>
                  <th scope="col">Status</th>
                  <th scope="col">Sent</th>
                  <th scope="col" className="text-right">
                    Total
                  </th>
                  <th scope="col" className="text-right">
                    Deposit
                  </th>
                  <th scope="col">Change</th>
                </tr>
              </thead>
              <tbody>
                {view.revisions.map((r) => (
                  <tr key={r.id}>
                    <td className="figure">{r.revision}</td>
                    <td>{STATUS_WORDS[r.status] ?? r.status}</td>
                    <td className="figure">
                      {formatDateTime(r.sentAt, { timeZone, style: "compact" })} {r.sentByName ? `by ${r.sentByName}` : ""}
                    </td>
                    <td className="figure text-right">{moneyText(r.totalMinor, r.currency, policy.currency.exponent)}</td>
                    <td className="figure text-right">{moneyText(r.depositMinor, r.currency, policy.currency.exponent)}</td>
                    <td>{r.changeSummary ?? (r.declineReason ? `Declined: ${r.declineReason}` : "—")}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      ) : null}
    </form>
  );
}

export function EstimatePanel({ jobId }: { jobId: string }) {
  const qc = useQueryClient();
  // The builder keeps its own edits (useForm reads its defaults once); it starts over only when asked to
  // load the saved version, by a new key.
  const [generation, setGeneration] = useState(0);
  const q = useQuery({ queryKey: benchKeys.estimate(jobId), queryFn: () => fetchEstimate(jobId) });
  if (q.isPending) return <p role="status">Loading the estimate…</p>;
  if (q.isError) return <Notice tone="error">{errorText(q.error)}</Notice>;
  const reload = async () => {
    await qc.refetchQueries({ queryKey: benchKeys.estimate(jobId) });
    setGeneration((g) => g + 1);
  };
  return <Builder key={generation} view={q.data} onReload={() => void reload()} />;
}
