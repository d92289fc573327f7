import type { Metadata } from "next";
import Link from "next/link";
import { count, eq } from "drizzle-orm";
import { db } from "@/db";
import { jobs, user } from "@/db/schema";
import { requirePermission } from "@/lib/session";

export const metadata: Metadata = { title: "Office" };

export default async function OfficePage() {
  const viewer = await requirePermission("office.use", "/office");
  const [[openJobs], [staff]] = await Promise.all([
    db.select({ n: count() }).from(jobs),
    db.select({ n: count() }).from(user).where(eq(user.role, "technician")),
  ]);
  const tiles = [
    { href: "/office/settings", title: "Rates & policy", text: "Labour rate, billing increment, minutes per checklist rule, tax, deposit policy, warranty wording and tolerances." },
    { href: "/office/staff", title: "Staff", text: "Invite technicians, change roles, deactivate accounts." },
    { href: "/office/payments", title: "Payments", text: "Deposits and balances received, refunds." },
    { href: "/office/audit", title: "Audit log", text: "Every change: who, what, when, before and after." },
    { href: "/office/reports", title: "Reports", text: "Jobs per state, turnaround, deposits and revenue per month." },
    { href: "/bench", title: "The bench", text: "The job queue, estimates, bench sheets and certificates." },
  ];
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-3xl font-bold">Good day, {viewer.name.split(" ")[0]}</h1>
        <p className="text-bakelite-soft">
          <span className="figure">{openJobs?.n ?? 0}</span> jobs on file · <span className="figure">{staff?.n ?? 0}</span> technicians
        </p>
      </div>
      <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        {tiles.map((t) => (
          <li key={t.href} className="card p-4">
            <h2 className="text-lg font-semibold">
              <Link href={t.href}>{t.title}</Link>
            </h2>
            <p className="mt-1 text-sm text-bakelite-soft">{t.text}</p>
          </li>
        ))}
      </ul>
    </div>
  );
}
