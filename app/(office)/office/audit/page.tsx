import type { Metadata } from "next";
import Link from "next/link";
import { AuditChange } from "@/components/office/audit-change";
import { auditRecordHref, auditSentence, entityWord } from "@/components/office/audit-sentence";
import { formatWhen } from "@/components/office/format";
import { Notice } from "@/components/ui/notice";
import { AUDIT_PAGE_SIZE, auditFilterOptionsForOwner, listAuditEventsForOwner } from "@/db/queries/audit";
import { zodFields } from "@/lib/server/route-handler";
import { getShop } from "@/lib/server/services/shop";
import { requirePermission } from "@/lib/server/session";
import { auditFilterSchema, type AuditFilter } from "@/lib/validation/office";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata: Metadata = { title: "Audit log" };

type SP = Record<string, string | string[] | undefined>;

function first(sp: SP): Record<string, string> {
  return Object.fromEntries(Object.entries(sp).map(([k, v]) => [k, Array.isArray(v) ? (v[0] ?? "") : (v ?? "")]));
}

export default async function AuditPage({ searchParams }: { searchParams: Promise<SP> }) {
  await requirePermission("audit.read", "/office/audit");
  const raw = first(await searchParams);
  const parsed = auditFilterSchema.safeParse(raw);
  const filter: AuditFilter = parsed.success ? parsed.data : { page: 1 };
  const problems = parsed.success ? null : zodFields(parsed.error);
  const [{ rows, hasMore, total }, options, shop] = await Promise.all([
    listAuditEventsForOwner({ filter }),
    auditFilterOptionsForOwner(),
    getShop(),
  ]);
  const currency = shop.policy.currency;
  const query = (page: number) => {
    const q = new URLSearchParams();
    for (const k of ["actor", "entity", "action", "from", "to"] as const) if (filter[k]) q.set(k, String(filter[k]));
    q.set("page", String(page));
    return `/office/audit?${q}`;
  };
  const firstRow = (filter.page - 1) * AUDIT_PAGE_SIZE + 1;

  return (
    <div className="space-y-5">
      <div>
        <h1 className="text-3xl font-bold">Audit log</h1>
        <p className="max-w-prose text-bakelite-soft">
          Every change to jobs, estimates, payments, staff and settings: who made it, when, and what it was before and after.
        </p>
      </div>

      <form
        method="get"
        action="/office/audit"
        className="card grid gap-3 p-4 sm:grid-cols-2 lg:grid-cols-6"
        aria-label="Filter the audit log"
      >
        <div className="lg:col-span-2">
          <label htmlFor="filter-actor" className="field-label">
            Who
          </label>
          <select id="filter-actor" name="actor" defaultValue={filter.actor ?? ""} className="field-input">
            <option value="">Anyone</option>
            {options.actors.map((a) => (
              <option key={a.value} value={a.value}>
                {a.label}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="filter-entity" className="field-label">
            What kind of record
          </label>
          <select id="filter-entity" name="entity" defaultValue={filter.entity ?? ""} className="field-input">
            <option value="">Any</option>
            {options.entities.map((e) => (
              <option key={e} value={e}>
                {e}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="filter-action" className="field-label">
            Action
          </label>
          <select id="filter-action" name="action" defaultValue={filter.action ?? ""} className="field-input">
            <option value="">Any</option>
            {options.actions.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="filter-from" className="field-label">
            From (UTC day)
          </label>
          <input
            id="filter-from"
            name="from"
            type="date"
            defaultValue={filter.from ?? ""}
            className="field-input"
            aria-invalid={!!problems?.from}
            aria-describedby={problems?.from ? "filter-from-error" : undefined}
          />
          {problems?.from ? (
            <p id="filter-from-error" className="field-error">
              {problems.from}
            </p>
          ) : null}
        </div>
        <div>
          <label htmlFor="filter-to" className="field-label">
            To (UTC day, included)
          </label>
          <input
            id="filter-to"
            name="to"
            type="date"
            defaultValue={filter.to ?? ""}
            className="field-input"
            aria-invalid={!!problems?.to}
            aria-describedby={problems?.to ? "filter-to-error" : undefined}
          />
          {problems?.to ? (
            <p id="filter-to-error" className="field-error">
              {problems.to}
            </p>
          ) : null}
        </div>
        <div className="flex items-end gap-3 lg:col-span-6">
          <button type="submit" className="btn-primary">
            Show
          </button>
          <Link href="/office/audit" className="btn-quiet">
            Clear filters
          </Link>
        </div>
      </form>

      {problems ? (
        <Notice tone="error" title="Some filters were not understood">
          <p>They are marked above; the log below is unfiltered.</p>
        </Notice>
      ) : null}

      <section aria-labelledby="audit-rows" className="card overflow-x-auto p-4">
        <h2 id="audit-rows" className="mb-2 text-lg font-semibold">
          {total === 0 ? "No entries" : `Entries ${firstRow}–${firstRow + rows.length - 1} of ${total}`}
        </h2>
        {rows.length > 0 ? (
          <TableScroll label="Audit entries">
            <table className="dense-table">
              <thead>
                <tr>
                  <th scope="col">When</th>
                  <th scope="col">What happened</th>
                  <th scope="col">Before → after</th>
                </tr>
              </thead>
              <tbody>
                {rows.map((r) => (
                  <tr key={r.id}>
                    <td className="figure whitespace-nowrap">{formatWhen(r.at, shop.timeZone)}</td>
                    <td className="min-w-56">
                      <p>
                        <span className="font-semibold">{r.actorId ? (r.actorName ?? "A former account") : "Bandedge"}</span>{" "}
                        {auditSentence(r, currency)}
                        {(() => {
                          const href = auditRecordHref(r);
                          return href ? (
                            <>
                              {" "}
                              (<Link href={href}>open the {entityWord(r.entity)}</Link>)
                            </>
                          ) : null;
                        })()}
                      </p>
                      <details className="mt-1 text-xs text-bakelite-muted">
                        <summary className="min-h-6 cursor-pointer py-1">Details</summary>
                        <span className="figure break-all">
                          {r.action} · {r.entity} {r.entityId}
                        </span>
                      </details>
                    </td>
                    <td className="min-w-72">
                      <AuditChange before={r.before} after={r.after} currency={currency} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableScroll>
        ) : (
          <p className="text-sm text-bakelite-soft">Nothing matches these filters.</p>
        )}
        <nav aria-label="Pages" className="mt-3 flex gap-4 text-sm">
          {filter.page > 1 ? <Link href={query(filter.page - 1)}>← Newer</Link> : null}
          <span>Page {filter.page}</span>
          {hasMore ? <Link href={query(filter.page + 1)}>Older →</Link> : null}
        </nav>
      </section>
    </div>
  );
}
