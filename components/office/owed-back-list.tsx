import type { OwedBackRow } from "@/lib/server/services/account";
import { jobNumber, STATE_LABEL, type JobState } from "@/lib/engine/jobs/states";
import { formatMoney, type Currency } from "./format";

// Money the shop holds beyond a job's total, and payments that arrived for a superseded checkout: each to
// refund (open the payment) or to keep against the balance.
export function OwedBackList({ rows, currency }: { rows: OwedBackRow[]; currency: Currency }) {
  return (
    <section aria-labelledby="owed-back-title" className="card space-y-2 p-4" data-testid="owed-back">
      <h2 id="owed-back-title" className="text-xl font-bold">
        Owed back to owners
      </h2>
      {rows.length === 0 ? (
        <p className="text-sm text-bakelite-soft">Nothing is owed back.</p>
      ) : (
        <table className="dense-table">
          <thead>
            <tr>
              <th scope="col">Job</th>
              <th scope="col">Owner</th>
              <th scope="col">State</th>
              <th scope="col" className="text-right">
                Owed back
              </th>
              <th scope="col">Why</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.jobId}>
                <td className="figure whitespace-nowrap">{jobNumber(r.jobNumber)}</td>
                <td>{r.customerName}</td>
                <td>{STATE_LABEL[r.state as JobState]?.staff ?? r.state}</td>
                <td className="figure whitespace-nowrap text-right">{formatMoney(r.owedBackMinor, currency)}</td>
                <td className="text-sm">
                  {r.stalePayment ? (
                    <span>
                      <span aria-hidden="true">⚠ </span>A payment arrived for a superseded checkout
                    </span>
                  ) : (
                    "Paid more than the final total"
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
