import type { Metadata } from "next";
import Link from "next/link";
import { formatMoney, formatWhen } from "@/components/office/format";
import { METHOD_LABEL, PAYMENT_STATUS_LABEL, PURPOSE_LABEL } from "@/components/office/labels";
import { ManualPaymentForm } from "@/components/office/manual-payment-form";
import { OwedBackList } from "@/components/office/owed-back-list";
import { listPaymentsForOffice } from "@/db/queries/office";
import { listOwedBack } from "@/lib/server/services/account";
import { jobNumber } from "@/lib/engine/jobs/states";
import { getShop } from "@/lib/server/services/shop";
import { requirePermission } from "@/lib/server/session";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata: Metadata = { title: "Payments" };

const FILTERS = [
  { value: "all", label: "All" },
  { value: "paid", label: "Received" },
  { value: "open", label: "Awaiting payment" },
] as const;

export default async function PaymentsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requirePermission("payment.refund", "/office/payments");
  const sp = await searchParams;
  const page = Math.max(1, Math.min(100_000, Number.parseInt(String(sp.page ?? "1"), 10) || 1));
  const status = FILTERS.find((f) => f.value === sp.status)?.value ?? "all";
  const [{ rows, hasMore }, shop, owedBack] = await Promise.all([listPaymentsForOffice({ page, status }), getShop(), listOwedBack()]);
  const currency = shop.policy.currency;
  const href = (p: number) => `/office/payments?${new URLSearchParams({ status, page: String(p) })}`;
  return (
    <div className="space-y-5">
      <div>
        <h1 className="text-3xl font-bold">Payments</h1>
        <p className="max-w-prose text-bakelite-soft">
          Deposits and balances, paid online or at the counter. Open a payment to refund part or all of it; every payment received has a
          numbered receipt.
        </p>
      </div>
      <ManualPaymentForm currency={currency} />
      <OwedBackList rows={owedBack} currency={currency} />
      <nav aria-label="Show payments" className="flex gap-3 text-sm">
        {FILTERS.map((f) =>
          f.value === status ? (
            <span key={f.value} aria-current="page" className="font-semibold">
              {f.label}
            </span>
          ) : (
            <Link key={f.value} href={`/office/payments?status=${f.value}`}>
              {f.label}
            </Link>
          ),
        )}
      </nav>
      <section aria-labelledby="payments-table" className="card overflow-x-auto p-4">
        <h2 id="payments-table" className="sr-only">
          Payments, newest first
        </h2>
        {rows.length === 0 ? (
          <p className="text-sm text-bakelite-soft">No payments to show.</p>
        ) : (
          <TableScroll label="Payments">
            <table className="dense-table">
              <thead>
                <tr>
                  <th scope="col">Job</th>
                  <th scope="col">Set and owner</th>
                  <th scope="col">Purpose</th>
                  <th scope="col">Method</th>
                  <th scope="col" className="text-right">
                    Amount
                  </th>
                  <th scope="col">Status</th>
                  <th scope="col">Paid at</th>
                  <th scope="col" className="text-right">
                    Refunded so far
                  </th>
                  <th scope="col">Receipt</th>
                  <th scope="col">
                    <span className="sr-only">Open</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {rows.map((p) => (
                  <tr key={p.id}>
                    <td className="figure whitespace-nowrap">{jobNumber(p.jobNumber)}</td>
                    <td>
                      {p.maker} {p.model}
                      <span className="block text-xs text-bakelite-muted">{p.customerName}</span>
                    </td>
                    <td>{PURPOSE_LABEL[p.purpose]}</td>
                    <td>{METHOD_LABEL[p.method]}</td>
                    <td className="figure whitespace-nowrap text-right">{formatMoney(p.amountMinor, currency)}</td>
                    <td>
                      <span aria-hidden="true">{PAYMENT_STATUS_LABEL[p.status].icon} </span>
                      {PAYMENT_STATUS_LABEL[p.status].text}
                    </td>
                    <td className="figure whitespace-nowrap">{formatWhen(p.paidAt, shop.timeZone)}</td>
                    <td className="figure whitespace-nowrap text-right">
                      {formatMoney(p.refundedMinor, currency)}
                      {p.inFlightMinor > 0 ? (
                        <span className="block text-xs text-bakelite-muted">+ {formatMoney(p.inFlightMinor, currency)} waiting</span>
                      ) : null}
                    </td>
                    <td className="whitespace-nowrap">
                      {p.receiptId ? (
                        <a href={`/api/documents/${p.receiptId}/pdf`} download className="figure">
                          {p.receiptNumber}
                          <span className="sr-only"> (PDF)</span>
                        </a>
                      ) : (
                        "—"
                      )}
                    </td>
                    <td>
                      <Link href={`/office/payments/${p.id}`}>
                        {p.method === "card" && (p.status === "paid" || p.status === "duplicate") ? "Open / refund" : "Open"}
                        <span className="sr-only">
                          {" "}
                          {PURPOSE_LABEL[p.purpose].toLowerCase()} for {jobNumber(p.jobNumber)}
                        </span>
                      </Link>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableScroll>
        )}
        <nav aria-label="Pages" className="mt-3 flex gap-4 text-sm">
          {page > 1 ? <Link href={href(page - 1)}>← Newer</Link> : null}
          <span>Page {page}</span>
          {hasMore ? <Link href={href(page + 1)}>Older →</Link> : null}
        </nav>
      </section>
    </div>
  );
}
