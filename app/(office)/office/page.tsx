import type { Metadata } from "next";
import Link from "next/link";
import { FailedMailList } from "@/components/office/failed-mail-list";
import { formatMoney, formatWhen } from "@/components/office/format";
import { REFUND_STATUS_LABEL } from "@/components/office/labels";
import { jobNumber } from "@/lib/engine/jobs/states";
import { listFailedEmailsForOffice, listOpenRefundsForOffice, officeOverviewFigures } from "@/db/queries/office";
import { getShop } from "@/lib/server/services/shop";
import { shopForecast } from "@/lib/server/services/turnaround";
import { canAccess } from "@/lib/engine/permissions";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "Office" };

export default async function OfficePage() {
  const viewer = await requirePermission("office.use", "/office");
  const [figures, shop, openRefunds, failedMail, forecast] = await Promise.all([
    officeOverviewFigures(),
    getShop(),
    listOpenRefundsForOffice(),
    listFailedEmailsForOffice(),
    shopForecast(),
  ]);
  const currency = shop.policy.currency;
  const stats = [
    { label: "Open jobs", value: String(figures.open_jobs), href: "/bench" },
    { label: "On the bench", value: String(figures.on_bench), href: "/bench" },
    { label: "Balance due", value: String(figures.balance_due), href: "/bench" },
    { label: "Received this month", value: formatMoney(figures.paid_this_month, currency), href: "/office/reports" },
    { label: "Refunds waiting for the processor", value: String(figures.refunds_in_flight), href: "/office/payments" },
    {
      label: "Bench backlog",
      value:
        forecast.backlogWeeks === null ? "No bench hours set" : `${new Intl.NumberFormat("en-GB").format(forecast.backlogWeeks)} weeks`,
      href: "/office/staff",
    },
    { label: "Active technicians", value: String(figures.technicians), href: "/office/staff" },
  ];
  const tiles = [
    {
      href: "/office/settings",
      title: "Rates & policy",
      text: "Shop identity, labour rate, billing increment, minutes per checklist rule, parts, tax, deposit policy, warranty wording and tolerances.",
    },
    ...(canAccess(viewer, "job.intake")
      ? [
          {
            href: "/bench/intake",
            title: "Take in a set",
            text: "A customer at the counter or on the phone: find or add them, open the job.",
          },
        ]
      : []),
    { href: "/office/staff", title: "Staff", text: "Invite technicians, change roles, deactivate accounts." },
    { href: "/office/payments", title: "Payments", text: "Deposits and balances received; full or partial refunds." },
    { href: "/office/audit", title: "Audit log", text: "Every change: who, what, when, before and after." },
    { href: "/office/reports", title: "Reports", text: "Jobs per state, turnaround, deposits and revenue per month." },
    { href: "/bench", title: "The bench", text: "The job queue, estimates, bench sheets and certificates." },
  ];
  return (
    <div className="space-y-8">
      <div>
        <h1 className="text-3xl font-bold">Good day, {viewer.name.split(" ")[0]}</h1>
        <p className="text-bakelite-soft">{shop.name} at a glance.</p>
      </div>
      <section aria-labelledby="glance">
        <h2 id="glance" className="sr-only">
          Figures
        </h2>
        <dl className="grid gap-3 sm:grid-cols-3 lg:grid-cols-7">
          {stats.map((s) => (
            <div key={s.label} className="card p-3">
              <dt className="text-xs text-bakelite-soft">{s.label}</dt>
              <dd className="figure mt-1 text-xl font-semibold">
                <Link href={s.href} className="text-bakelite no-underline hover:underline">
                  {s.value}
                </Link>
              </dd>
            </div>
          ))}
        </dl>
      </section>
      <section aria-labelledby="open-refunds" className="card p-5">
        <h2 id="open-refunds" className="text-xl font-semibold">
          Refunds not settled yet
        </h2>
        <p className="mb-2 text-sm text-bakelite-soft">
          A pending refund may already have been made: do not refund it again. Bandedge keeps asking the processor; open the payment to
          check now.
        </p>
        {openRefunds.length === 0 ? (
          <p className="text-sm text-bakelite-soft">None: every refund asked for has been settled.</p>
        ) : (
          <ul className="space-y-1 text-sm" data-testid="open-refunds">
            {openRefunds.map((r) => (
              <li key={r.id}>
                <Link href={`/office/payments/${r.paymentId}`}>
                  {formatMoney(r.amountMinor, currency)} for job {jobNumber(r.jobNumber)} ({r.customerName})
                </Link>{" "}
                — <span aria-hidden="true">{REFUND_STATUS_LABEL[r.status].icon} </span>
                {REFUND_STATUS_LABEL[r.status].text}, asked {formatWhen(r.createdAt, shop.timeZone)}
              </li>
            ))}
          </ul>
        )}
      </section>
      <section aria-labelledby="failed-mail" className="card p-5">
        <h2 id="failed-mail" className="mb-2 text-xl font-semibold">
          E-mail that could not be sent
        </h2>
        <FailedMailList rows={failedMail.map((m) => ({ ...m, createdAt: m.createdAt.toISOString() }))} />
      </section>
      <section aria-labelledby="sections">
        <h2 id="sections" className="sr-only">
          Sections
        </h2>
        <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
          {tiles.map((t) => (
            <li key={t.href} className="card p-4">
              <h3 className="text-lg font-semibold">
                <Link href={t.href}>{t.title}</Link>
              </h3>
              <p className="mt-1 text-sm text-bakelite-soft">{t.text}</p>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
