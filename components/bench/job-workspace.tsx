"use client";

import { useQuery } from "@tanstack/react-query";
import { useRef, useState, type KeyboardEvent } from "react";
import { StateBadge } from "@/components/state-badge";
import { Notice } from "@/components/ui/notice";
import type { Band } from "@/lib/engine/bands/band";
import { setKindLabels, setKinds, type SetKind } from "@/lib/engine/checklist/profile";
import type { JobState } from "@/lib/engine/jobs/states";
import { SHOP_CANCELLABLE, STATE_LABEL, staffStateLabel } from "@/lib/engine/jobs/states";
import { AlignmentCalculator } from "./alignment-calculator";
import { api, errorText } from "@/lib/client/bench-api";
import { BenchSheetPanel } from "./bench-sheet";
import { CompletionPanel } from "./completion-panel";
import { EstimatePanel } from "./estimate-builder";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { TriagePanel } from "./triage-panel";
import { CancelJobPanel } from "./cancel-job-panel";
import { JobThread } from "./job-thread";
import { RecordDecisionPanel, RecordedDecisions } from "./recorded-decision-panel";
import { CHANNEL_LABEL } from "@/lib/engine/contacts";
import type { JobDetailJson } from "./types";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDateTime } from "@/lib/engine/dates";

const TABS = [
  { id: "triage", label: "Triage" },
  { id: "estimate", label: "Estimate" },
  { id: "sheet", label: "Bench sheet" },
  { id: "alignment", label: "Alignment" },
  { id: "completion", label: "Completion" },
] as const;
type TabId = (typeof TABS)[number]["id"];

function tabFor(state: JobState): TabId {
  if (state === "requested" || state === "in_triage" || state === "awaiting_owner") return "triage";
  if (state === "estimate_sent" || state === "approved") return "estimate";
  if (state === "on_bench" || state === "bench_revision") return "sheet";
  return "completion";
}

function profileBands(detail: JobDetailJson): Band[] {
  const bands = (detail.set.profile as { bands?: unknown }).bands;
  if (!Array.isArray(bands)) return [];
  return bands.filter(
    (b): b is Band =>
      typeof b === "object" &&
      b !== null &&
      typeof (b as Band).lowKHz === "number" &&
      typeof (b as Band).highKHz === "number" &&
      typeof (b as Band).ifKHz === "number",
  );
}

export function JobWorkspace({ jobId, canCancel = false, canRecord = false }: { jobId: string; canCancel?: boolean; canRecord?: boolean }) {
  const timeZone = useShopTimeZone();
  const q = useQuery({ queryKey: benchKeys.job(jobId), queryFn: () => api<JobDetailJson>(`/api/bench/jobs/${jobId}`) });
  const [tab, setTab] = useState<TabId | null>(null);
  const tabRefs = useRef<Record<string, HTMLButtonElement | null>>({});
  if (q.isPending) return <p role="status">Loading the job…</p>;
  if (q.isError) return <Notice tone="error">{errorText(q.error)}</Notice>;
  const d = q.data;
  const current = tab ?? tabFor(d.job.state);
  const kind = (setKinds as readonly string[]).includes(d.set.kind) ? (d.set.kind as SetKind) : null;

  // Arrow keys move between tabs (the usual tab-list pattern); Tab moves into the panel.
  const onKey = (e: KeyboardEvent<HTMLButtonElement>) => {
    const i = TABS.findIndex((t) => t.id === current);
    let next = -1;
    if (e.key === "ArrowRight") next = (i + 1) % TABS.length;
    if (e.key === "ArrowLeft") next = (i - 1 + TABS.length) % TABS.length;
    if (e.key === "Home") next = 0;
    if (e.key === "End") next = TABS.length - 1;
    if (next >= 0) {
      e.preventDefault();
      setTab(TABS[next]!.id);
      tabRefs.current[TABS[next]!.id]?.focus();
    }
  };

  return (
    <div className="space-y-3">
      <header className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
        <h1 className="text-2xl font-bold">
          <span className="figure">{d.job.jobNumber}</span> · {d.set.maker} {d.set.model}
          {d.set.year ? <span className="text-bakelite-muted"> ({d.set.year})</span> : null}
        </h1>
        <StateBadge state={d.job.state} audience="staff" setAtShop={Boolean(d.job.receivedAt)} />
        <p className="text-sm">
          {kind ? setKindLabels[kind] : d.set.kind} · owner {d.customer.name} (
          {[d.customer.email, d.customer.phone].filter(Boolean).join(", ") || "no contact details"}
          {d.customer.contactOnly ? ", contact without sign-in" : ""}) · {CHANNEL_LABEL[d.job.channel]}
          {d.job.receivedAt ? " · set at the shop" : ""} · {d.technicianName ? `with ${d.technicianName}` : "unassigned"}
          {d.job.isWarranty ? " · warranty job" : ""}
        </p>
      </header>
      <p className="sr-only" role="status" aria-live="polite">
        State: {staffStateLabel(d.job.state, Boolean(d.job.receivedAt))}
      </p>

      <div role="tablist" aria-label="Job sections" className="flex flex-wrap gap-1 border-b border-dial-rule">
        {TABS.map((t) => (
          <button
            key={t.id}
            ref={(el) => {
              tabRefs.current[t.id] = el;
            }}
            type="button"
            role="tab"
            id={`tab-${t.id}`}
            aria-selected={current === t.id}
            aria-controls={`panel-${t.id}`}
            tabIndex={current === t.id ? 0 : -1}
            onKeyDown={onKey}
            onClick={() => setTab(t.id)}
            className={`-mb-px rounded-t border px-3 py-1.5 text-sm font-semibold ${current === t.id ? "border-dial-rule border-b-white bg-white text-bakelite" : "border-transparent text-ember-dark hover:bg-dial-deep"}`}
          >
            {t.label}
          </button>
        ))}
      </div>

      <div role="tabpanel" id={`panel-${current}`} aria-labelledby={`tab-${current}`} tabIndex={-1}>
        {current === "triage" ? <TriagePanel detail={d} /> : null}
        {current === "estimate" ? <EstimatePanel jobId={jobId} /> : null}
        {current === "sheet" ? <BenchSheetPanel jobId={jobId} /> : null}
        {current === "alignment" ? (
          <AlignmentCalculator bands={profileBands(d)} hotChassis={d.set.kind === "tube-acdc"} jobId={jobId} />
        ) : null}
        {current === "completion" ? <CompletionPanel detail={d} /> : null}
      </div>

      {canRecord ? <RecordDecisionPanel detail={d} /> : null}
      <RecordedDecisions detail={d} />

      <JobThread jobId={jobId} />

      {canCancel && (SHOP_CANCELLABLE.includes(d.job.state) || d.job.state === "cancelled") ? (
        <CancelJobPanel jobId={jobId} cancelled={d.job.state === "cancelled"} />
      ) : null}

      <details className="card p-3 text-sm">
        <summary className="cursor-pointer font-semibold">History</summary>
        <ol className="mt-1 space-y-0.5">
          {d.history.map((h) => (
            <li key={h.id} className="figure text-xs">
              {formatDateTime(h.at, { timeZone, style: "compact" })} — {h.fromState ? `${STATE_LABEL[h.fromState].staff} → ` : ""}
              {STATE_LABEL[h.toState].staff}
              {h.actorName ? ` by ${h.actorName}` : ""}
              {h.note ? ` · ${h.note}` : ""}
            </li>
          ))}
        </ol>
      </details>
    </div>
  );
}
