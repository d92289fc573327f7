import type { Metadata } from "next";
import { formatMoney } from "@/components/office/format";
import { JobsPerStateChart, MoneyChart, TurnaroundChart } from "@/components/office/report-charts";
import { Notice } from "@/components/ui/notice";
import { reportsForOwner, resolveMonthRange } from "@/db/queries/reports";
import { zodFields } from "@/lib/server/route-handler";
import { STATE_LABEL } from "@/lib/engine/jobs/states";
import { getShop } from "@/lib/server/services/shop";
import { dayInZone } from "@/lib/engine/dates";
import { requirePermission } from "@/lib/server/session";
import { reportRangeSchema } from "@/lib/validation/office";
import { TableScroll } from "@/components/ui/table-scroll";
import { ExportForm } from "./_components/export-form";

export const metadata: Metadata = { title: "Reports" };

type SP = Record<string, string | string[] | undefined>;

function days(n: number | null): string {
  return n === null ? "—" : n.toFixed(1);
}

export default async function ReportsPage({ searchParams }: { searchParams: Promise<SP> }) {
  await requirePermission("reports.read", "/office/reports");
  const sp = await searchParams;
  const raw = { from: typeof sp.from === "string" ? sp.from : undefined, to: typeof sp.to === "string" ? sp.to : undefined };
  const parsed = reportRangeSchema.safeParse(raw);
  const problems = parsed.success ? null : zodFields(parsed.error);
  const range = resolveMonthRange(parsed.success ? parsed.data : {});
  const [r, shop] = await Promise.all([reportsForOwner(range), getShop()]);
  const currency = shop.policy.currency;
  const scale = 10 ** currency.exponent;
  const totals = r.money.reduce(
    (t, m) => ({
      deposits: t.deposits + m.depositsMinor,
      balances: t.balances + m.balancesMinor,
      refunds: t.refunds + m.refundsMinor,
      net: t.net + m.netMinor,
    }),
    { deposits: 0, balances: 0, refunds: 0, net: 0 },
  );
  const opened = r.jobsPerState.reduce((n, s) => n + s.count, 0);
  const shownStates = r.jobsPerState.filter((s) => s.count > 0);

  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-3xl font-bold">Reports</h1>
        <p className="max-w-prose text-bakelite-soft">
          From <span className="figure">{r.range.from}</span> to <span className="figure">{r.range.to}</span> (calendar months, UTC). Each
          chart has its figures in the table beside it.
        </p>
      </div>

      <form method="get" action="/office/reports" className="card flex flex-wrap items-end gap-4 p-4" aria-label="Choose the months">
        <div>
          <label htmlFor="range-from" className="field-label">
            First month
          </label>
          <input
            id="range-from"
            name="from"
            type="month"
            defaultValue={r.range.from}
            className="field-input figure"
            aria-invalid={!!problems?.from}
            aria-describedby={problems?.from ? "range-from-error" : undefined}
          />
          {problems?.from ? (
            <p id="range-from-error" className="field-error">
              {problems.from}
            </p>
          ) : null}
        </div>
        <div>
          <label htmlFor="range-to" className="field-label">
            Last month
          </label>
          <input
            id="range-to"
            name="to"
            type="month"
            defaultValue={r.range.to}
            className="field-input figure"
            aria-invalid={!!problems?.to}
            aria-describedby={problems?.to ? "range-to-error" : undefined}
          />
          {problems?.to ? (
            <p id="range-to-error" className="field-error">
              {problems.to}
            </p>
          ) : null}
        </div>
        <button type="submit" className="btn-primary">
          Show
        </button>
      </form>
      {problems ? (
        <Notice tone="error" title="Those months were not understood">
          <p>Showing the last twelve months instead.</p>
        </Notice>
      ) : null}

      <section aria-labelledby="r-states" className="card p-5">
        <h2 id="r-states" className="text-xl font-semibold">
          Jobs opened in the period, by where they are now
        </h2>
        <p className="text-sm text-bakelite-soft">
          <span className="figure">{opened}</span> {opened === 1 ? "job" : "jobs"} opened.
        </p>
        <div className="mt-3 grid gap-6 lg:grid-cols-[1fr_20rem]">
          {shownStates.length ? (
            <JobsPerStateChart data={shownStates.map((s) => ({ label: STATE_LABEL[s.state].staff, count: s.count }))} />
          ) : (
            <p className="text-sm">No jobs opened in these months.</p>
          )}
          <TableScroll label="Jobs by state">
            <table className="dense-table h-fit" id="table-states">
              <caption className="sr-only">Jobs per state</caption>
              <thead>
                <tr>
                  <th scope="col">State</th>
                  <th scope="col" className="text-right">
                    Jobs
                  </th>
                </tr>
              </thead>
              <tbody>
                {r.jobsPerState.map((s) => (
                  <tr key={s.state} data-state={s.state}>
                    <th scope="row" className="bg-transparent font-normal">
                      <span aria-hidden="true">{STATE_LABEL[s.state].icon} </span>
                      {STATE_LABEL[s.state].staff}
                    </th>
                    <td className="figure text-right">{s.count}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableScroll>
        </div>
      </section>

      <section aria-labelledby="r-turnaround" className="card p-5">
        <h2 id="r-turnaround" className="text-xl font-semibold">
          Turnaround from receipt to return
        </h2>
        <p className="text-sm text-bakelite-soft">
          Median{" "}
          <span className="figure font-semibold text-bakelite" data-testid="median-turnaround">
            {days(r.turnaround.medianDays)}
          </span>{" "}
          days over <span className="figure">{r.turnaround.jobs}</span> returned jobs. Receipt is the day the set arrived (or first went on
          the bench); return is the day it was picked up or shipped.
        </p>
        <div className="mt-3 grid gap-6 lg:grid-cols-[1fr_20rem]">
          <TurnaroundChart
            data={r.turnaround.byMonth.map((m) => ({
              month: m.month,
              medianDays: m.medianDays === null ? null : Number(m.medianDays.toFixed(1)),
            }))}
          />
          <TableScroll label="Turnaround by month">
            <table className="dense-table h-fit" id="table-turnaround">
              <caption className="sr-only">Median turnaround per month of return</caption>
              <thead>
                <tr>
                  <th scope="col">Month returned</th>
                  <th scope="col" className="text-right">
                    Jobs
                  </th>
                  <th scope="col" className="text-right">
                    Median days
                  </th>
                </tr>
              </thead>
              <tbody>
                {r.turnaround.byMonth.map((m) => (
                  <tr key={m.month}>
                    <th scope="row" className="figure bg-transparent font-normal">
                      {m.month}
                    </th>
                    <td className="figure text-right">{m.jobs}</td>
                    <td className="figure text-right">{days(m.medianDays)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableScroll>
        </div>
      </section>

      <section aria-labelledby="r-money" className="card p-5">
        <h2 id="r-money" className="text-xl font-semibold">
          Deposits and revenue per month
        </h2>
        <p className="text-sm text-bakelite-soft">
          Payments by the month they were received; refunds by the month the processor confirmed them. Net revenue is what was received less
          refunds.
        </p>
        <div className="mt-3 space-y-4">
          <MoneyChart
            currency={currency.code}
            data={r.money.map((m) => ({
              month: m.month,
              deposits: m.depositsMinor / scale,
              balances: m.balancesMinor / scale,
              refunds: m.refundsMinor / scale,
            }))}
          />
          <div className="overflow-x-auto">
            <TableScroll label="Money by month">
              <table className="dense-table" id="table-money">
                <caption className="sr-only">Money per month</caption>
                <thead>
                  <tr>
                    <th scope="col">Month</th>
                    <th scope="col" className="text-right">
                      Deposits
                    </th>
                    <th scope="col" className="text-right">
                      Balances
                    </th>
                    <th scope="col" className="text-right">
                      Refunds
                    </th>
                    <th scope="col" className="text-right">
                      Net revenue
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {r.money.map((m) => (
                    <tr key={m.month} data-month={m.month}>
                      <th scope="row" className="figure bg-transparent font-normal">
                        {m.month}
                      </th>
                      <td className="figure whitespace-nowrap text-right">{formatMoney(m.depositsMinor, currency)}</td>
                      <td className="figure whitespace-nowrap text-right">{formatMoney(m.balancesMinor, currency)}</td>
                      <td className="figure whitespace-nowrap text-right">{formatMoney(m.refundsMinor, currency)}</td>
                      <td className="figure whitespace-nowrap text-right">{formatMoney(m.netMinor, currency)}</td>
                    </tr>
                  ))}
                </tbody>
                <tfoot>
                  <tr>
                    <th scope="row" className="border-t border-bakelite-soft px-2 py-1.5 text-left">
                      Total
                    </th>
                    <td className="figure border-t border-bakelite-soft px-2 py-1.5 text-right">
                      {formatMoney(totals.deposits, currency)}
                    </td>
                    <td className="figure border-t border-bakelite-soft px-2 py-1.5 text-right">
                      {formatMoney(totals.balances, currency)}
                    </td>
                    <td className="figure border-t border-bakelite-soft px-2 py-1.5 text-right">{formatMoney(totals.refunds, currency)}</td>
                    <td className="figure border-t border-bakelite-soft px-2 py-1.5 text-right">{formatMoney(totals.net, currency)}</td>
                  </tr>
                </tfoot>
              </table>
            </TableScroll>
          </div>
        </div>
      </section>
      <section aria-labelledby="exports" className="card space-y-2 p-4">
        <h2 id="exports" className="text-lg font-semibold">
          Files for the accountant
        </h2>
        <p className="max-w-prose text-sm text-bakelite-soft">
          CSV files for a range of days (UTC), both days included: payments received and refunds confirmed; jobs opened; tax on jobs paid in
          full, by month, labour and parts apart; and the audit log.
        </p>
        <ExportForm defaultFrom={`${r.range.from}-01`} defaultTo={dayInZone(new Date(), "UTC")} />
      </section>
    </div>
  );
}
