"use client";

import { keepPreviousData, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  createColumnHelper,
  rowPaginationFeature,
  rowSortingFeature,
  tableFeatures,
  useTable,
  type PaginationState,
  type SortingState,
} from "@tanstack/react-table";
import Link from "next/link";
import { useEffect, useId, useState } from "react";
import { StateBadge } from "@/components/state-badge";
import { Notice } from "@/components/ui/notice";
import { JOB_STATES, type JobState } from "@/lib/engine/jobs/states";
import { jobNumber, STATE_LABEL } from "@/lib/engine/jobs/states";
import type { QueueQueryInput, QueueSort } from "@/lib/validation/bench";
import { INITIAL_QUEUE_PARAMS } from "@/lib/validation/queue-params";
import { api, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { TableScroll } from "@/components/ui/table-scroll";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDateTime } from "@/lib/engine/dates";

type QueueRow = {
  id: string;
  number: number;
  state: JobState;
  isWarranty: boolean;
  /** The set is at the shop (handed over at the counter, or received). */
  setAtShop: boolean;
  createdAt: string;
  updatedAt: string;
  maker: string;
  model: string;
  year: number | null;
  kind: string;
  customerName: string;
  customerEmail: string;
  technicianId: string | null;
  technicianName: string | null;
  /** The owner's messages this staff member has not read. */
  unread: number;
};
type QueuePage = { rows: QueueRow[]; total: number; page: number; pageSize: number; pageCount: number };
type StaffMember = { id: string; name: string; role: string };

const features = tableFeatures({ rowSortingFeature, rowPaginationFeature });
const helper = createColumnHelper<typeof features, QueueRow>();
const emptyRows: QueueRow[] = [];

function AssignCell({ row, staff }: { row: QueueRow; staff: StaffMember[] }) {
  const qc = useQueryClient();
  const id = useId();
  const assign = useMutation({
    mutationFn: (technicianId: string | null) => api(`/api/bench/jobs/${row.id}/assign`, { method: "POST", body: { technicianId } }),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: benchKeys.queues() });
      void qc.invalidateQueries({ queryKey: benchKeys.job(row.id) });
    },
  });
  return (
    <div>
      <label htmlFor={id} className="sr-only">
        Technician for {jobNumber(row.number)}
      </label>
      <select
        id={id}
        className="rounded border border-bakelite-muted bg-white px-1 py-0.5 text-sm"
        value={row.technicianId ?? ""}
        disabled={assign.isPending}
        onChange={(e) => assign.mutate(e.target.value || null)}
      >
        <option value="">Unassigned</option>
        {staff.map((s) => (
          <option key={s.id} value={s.id}>
            {s.name}
          </option>
        ))}
      </select>
      {assign.isError ? (
        <p className="field-error" role="alert">
          {errorText(assign.error)}
        </p>
      ) : null}
    </div>
  );
}

// The first page as the server read it, so the queue is in the first paint rather than after a second request.
type InitialQueue = { queue: QueuePage; staff: StaffMember[]; readAt: number };

export function QueueTable({ viewerId, initial }: { viewerId: string; initial?: InitialQueue }) {
  const timeZone = useShopTimeZone();
  const [sorting, setSorting] = useState<SortingState>([{ id: "updatedAt", desc: true }]);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const [stateFilter, setStateFilter] = useState<string>("");
  const [technician, setTechnician] = useState<string>("");
  const [search, setSearch] = useState("");
  const [q, setQ] = useState("");
  const searchId = useId();
  const stateId = useId();
  const techId = useId();
  const sizeId = useId();

  // Typing settles for a moment before the queue is asked again.
  useEffect(() => {
    const t = setTimeout(() => {
      setQ(search.trim());
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    }, 250);
    return () => clearTimeout(t);
  }, [search]);

  const sort = sorting[0];
  const params: QueueQueryInput = {
    page: pagination.pageIndex + 1,
    pageSize: pagination.pageSize,
    sort: (sort?.id as QueueSort | undefined) ?? "updatedAt",
    dir: sort?.desc === false ? "asc" : "desc",
    states: stateFilter === "all" ? "" : stateFilter,
    includeClosed: stateFilter === "all" ? "1" : "0",
    technician,
    q,
  };
  const search_ = new URLSearchParams(Object.entries(params).map(([k, v]) => [k, String(v ?? "")]));
  const untouched = JSON.stringify(params) === JSON.stringify(INITIAL_QUEUE_PARAMS);
  const result = useQuery({
    queryKey: benchKeys.queue(params),
    queryFn: () => api<QueuePage>(`/api/bench/queue?${search_.toString()}`),
    placeholderData: keepPreviousData,
    initialData: untouched ? initial?.queue : undefined,
    initialDataUpdatedAt: initial?.readAt,
  });
  const staffQuery = useQuery({
    queryKey: benchKeys.staff(),
    queryFn: () => api<{ staff: StaffMember[] }>("/api/bench/staff"),
    initialData: initial ? { staff: initial.staff } : undefined,
    initialDataUpdatedAt: initial?.readAt,
  });
  const staff = staffQuery.data?.staff ?? [];

  const columns = helper.columns([
    helper.accessor("number", {
      id: "number",
      header: "Job",
      cell: (info) => (
        <span className="inline-flex flex-wrap items-center gap-1">
          {/* Not prefetched: a queue page would otherwise ask the server for every job on it at each visit. */}
          <Link className="figure font-semibold" href={`/bench/jobs/${info.row.original.id}`} prefetch={false}>
            {jobNumber(info.getValue())}
          </Link>
          {info.row.original.unread > 0 ? (
            <span className="rounded-full border border-ember px-1.5 text-xs font-semibold text-ember-dark" data-testid="unread-messages">
              {info.row.original.unread} new
              <span className="sr-only"> {info.row.original.unread === 1 ? "message" : "messages"} from the owner</span>
            </span>
          ) : null}
        </span>
      ),
    }),
    helper.accessor((r) => `${r.maker} ${r.model}`, {
      id: "set",
      header: "Set",
      cell: (info) => (
        <span>
          {info.getValue()}
          {info.row.original.year ? <span className="text-bakelite-muted"> ({info.row.original.year})</span> : null}
          {info.row.original.isWarranty ? <span className="ml-1 rounded border border-brass px-1 text-xs">Warranty</span> : null}
        </span>
      ),
    }),
    helper.accessor("customerName", { id: "customer", header: "Owner", cell: (info) => info.getValue() }),
    helper.accessor("state", {
      id: "state",
      header: "State",
      cell: (info) => <StateBadge state={info.getValue()} audience="staff" setAtShop={info.row.original.setAtShop} />,
    }),
    helper.accessor("technicianName", {
      id: "technician",
      header: "Technician",
      cell: (info) => <AssignCell row={info.row.original} staff={staff} />,
    }),
    helper.accessor("updatedAt", {
      id: "updatedAt",
      header: "Last change",
      cell: (info) => <span className="figure">{formatDateTime(info.getValue(), { timeZone, style: "compact" })}</span>,
    }),
  ]);

  const table = useTable({
    features,
    columns,
    data: result.data?.rows ?? emptyRows,
    rowCount: result.data?.total ?? 0,
    state: { sorting, pagination },
    onSortingChange: (u) => {
      setSorting(u);
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    },
    onPaginationChange: setPagination,
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
  });

  const total = result.data?.total ?? 0;
  const pageCount = result.data?.pageCount ?? 1;
  const first = total === 0 ? 0 : pagination.pageIndex * pagination.pageSize + 1;
  const last = Math.min(total, (pagination.pageIndex + 1) * pagination.pageSize);

  return (
    <div className="space-y-3">
      <form role="search" className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
        <div>
          <label htmlFor={searchId} className="field-label">
            Search
          </label>
          <input
            id={searchId}
            type="search"
            className="field-input w-72 py-1"
            placeholder="Owner, maker, model or KL-0042"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            aria-describedby={`${searchId}-hint`}
          />
          <p id={`${searchId}-hint`} className="sr-only">
            Searches the owner&apos;s name or e-mail, the maker, the model and the job number.
          </p>
        </div>
        <div>
          <label htmlFor={stateId} className="field-label">
            State
          </label>
          <select
            id={stateId}
            className="field-input py-1"
            value={stateFilter}
            onChange={(e) => {
              setStateFilter(e.target.value);
              setPagination((p) => ({ ...p, pageIndex: 0 }));
            }}
          >
            <option value="">Open jobs</option>
            <option value="all">All jobs, closed too</option>
            {JOB_STATES.map((s) => (
              <option key={s} value={s}>
                {STATE_LABEL[s].staff}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor={techId} className="field-label">
            Technician
          </label>
          <select
            id={techId}
            className="field-input py-1"
            value={technician}
            onChange={(e) => {
              setTechnician(e.target.value);
              setPagination((p) => ({ ...p, pageIndex: 0 }));
            }}
          >
            <option value="">Everyone</option>
            <option value="me">Mine</option>
            <option value="none">Unassigned</option>
            {staff
              .filter((s) => s.id !== viewerId)
              .map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
          </select>
        </div>
        <p className="pb-1 text-sm text-bakelite-muted" role="status" aria-live="polite">
          {result.isFetching ? "Loading…" : `${total} ${total === 1 ? "job" : "jobs"}`}
        </p>
      </form>

      {result.isError ? (
        <Notice tone="error" live>
          {errorText(result.error)}
        </Notice>
      ) : null}

      <div className="card overflow-x-auto">
        <TableScroll label="Job queue table">
          <table className="dense-table" aria-label="Job queue" aria-busy={result.isFetching}>
            <thead>
              {table.getHeaderGroups().map((group) => (
                <tr key={group.id}>
                  {group.headers.map((header) => {
                    const sorted = header.column.getIsSorted();
                    return (
                      <th
                        key={header.id}
                        scope="col"
                        aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"}
                      >
                        {header.isPlaceholder ? null : header.column.getCanSort() ? (
                          <button
                            type="button"
                            className="inline-flex items-center gap-1 font-semibold"
                            onClick={header.column.getToggleSortingHandler()}
                          >
                            <table.FlexRender header={header} />
                            <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                            <span className="sr-only">
                              {sorted ? `, sorted ${sorted === "asc" ? "ascending" : "descending"}` : ", sort"}
                            </span>
                          </button>
                        ) : (
                          <table.FlexRender header={header} />
                        )}
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody>
              {table.getRowModel().rows.map((row) => (
                <tr key={row.id} data-job={row.original.number}>
                  {row.getAllCells().map((cell) => (
                    <td key={cell.id}>
                      <table.FlexRender cell={cell} />
                    </td>
                  ))}
                </tr>
              ))}
              {result.data && result.data.rows.length === 0 ? (
                <tr>
                  <td colSpan={6} className="py-6 text-center text-bakelite-muted">
                    No jobs match these filters.
                  </td>
                </tr>
              ) : null}
            </tbody>
          </table>
        </TableScroll>
      </div>

      <nav aria-label="Queue pages" className="flex flex-wrap items-center gap-3 text-sm">
        <button type="button" className="btn-secondary py-1" onClick={() => table.previousPage()} disabled={pagination.pageIndex === 0}>
          ← Previous
        </button>
        <span className="figure">
          {first}–{last} of {total} · page {pagination.pageIndex + 1} of {pageCount}
        </span>
        <button
          type="button"
          className="btn-secondary py-1"
          onClick={() => table.nextPage()}
          disabled={pagination.pageIndex + 1 >= pageCount}
        >
          Next →
        </button>
        <label htmlFor={sizeId} className="ml-2">
          Rows per page
        </label>
        <select
          id={sizeId}
          className="rounded border border-bakelite-muted bg-white px-1 py-0.5"
          value={pagination.pageSize}
          onChange={(e) => table.setPageSize(Number(e.target.value))}
        >
          {[10, 25, 50, 100].map((n) => (
            <option key={n} value={n}>
              {n}
            </option>
          ))}
        </select>
      </nav>
    </div>
  );
}
