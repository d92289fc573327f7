import type { Metadata } from "next";
import Link from "next/link";
import { listClaimsForStaff } from "@/db/queries/claims";
import { jobNumber } from "@/lib/engine/jobs/states";
import { CLAIM_STATUS_LABEL, OUTCOME_LABEL, type StoredAdvice } from "@/lib/server/services/claims";
import { requirePermission } from "@/lib/server/session";
import { shopTimeZone } from "@/lib/server/services/shop";
import { formatDate } from "@/lib/engine/dates";
import { SYMPTOM_LABEL } from "@/lib/validation/claims";
import type { ClaimSymptom } from "@/lib/engine/warranty";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata: Metadata = { title: "Claims" };

const FILTERS = { open: ["open", "inspecting"], decided: ["accepted", "rejected", "withdrawn"], all: [] } as const;

export default async function BenchClaimsPage({ searchParams }: { searchParams: Promise<{ show?: string }> }) {
  await requirePermission("claim.review", "/bench/claims");
  const { show } = await searchParams;
  const filter = show === "decided" || show === "all" ? show : "open";
  const [rows, timeZone] = await Promise.all([listClaimsForStaff({ statuses: [...FILTERS[filter]] }), shopTimeZone()]);
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h1 className="text-2xl font-bold">Warranty claims</h1>
        <nav aria-label="Which claims" className="flex gap-3 text-sm">
          {(["open", "decided", "all"] as const).map((f) => (
            <Link
              key={f}
              href={`/bench/claims?show=${f}`}
              aria-current={f === filter ? "page" : undefined}
              className={f === filter ? "font-semibold" : ""}
            >
              {f === "open" ? "To decide" : f === "decided" ? "Decided" : "All"}
            </Link>
          ))}
        </nav>
      </div>
      {rows.length === 0 ? (
        <p className="text-bakelite-soft">No claims here.</p>
      ) : (
        <TableScroll label="Claims">
          <table className="dense-table w-full">
            <thead>
              <tr>
                <th scope="col">Opened</th>
                <th scope="col">Set</th>
                <th scope="col">Claimant</th>
                <th scope="col">Symptom</th>
                <th scope="col">Advice</th>
                <th scope="col">Status</th>
                <th scope="col">Original job</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => {
                const advice = r.claim.advice as unknown as StoredAdvice;
                const set = (r.certificateContent as { set?: { maker?: string; model?: string } }).set;
                const status = CLAIM_STATUS_LABEL[r.claim.status];
                return (
                  <tr key={r.claim.id}>
                    <td className="figure">{formatDate(r.claim.createdAt, { timeZone, style: "compact" })}</td>
                    <td>
                      <Link href={`/bench/claims/${r.claim.id}`}>
                        {set?.maker} {set?.model}
                      </Link>
                    </td>
                    <td>{r.claimantName}</td>
                    <td>{SYMPTOM_LABEL[r.claim.symptomCategory as ClaimSymptom] ?? r.claim.symptomCategory}</td>
                    <td>{OUTCOME_LABEL[advice.outcome] ?? "—"}</td>
                    <td>
                      <span aria-hidden="true">{status.icon} </span>
                      {status.staff}
                    </td>
                    <td className="figure">{jobNumber(r.jobNumber)}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </TableScroll>
      )}
    </div>
  );
}
