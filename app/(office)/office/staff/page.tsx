import type { Metadata } from "next";
import { listStaff } from "@/db/queries/staff";
import { isRole } from "@/lib/engine/permissions";
import { requirePermission } from "@/lib/server/session";
import { InviteForm, StaffRow } from "./_components/staff-controls";
import { BenchWeekForm } from "./_components/bench-week-form";
import { benchStaff } from "@/lib/server/services/turnaround";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata: Metadata = { title: "Staff" };

export default async function StaffPage() {
  const viewer = await requirePermission("staff.manage", "/office/staff");
  const [staff, bench] = await Promise.all([listStaff(), benchStaff()]);
  return (
    <div className="space-y-8">
      <h1 className="text-3xl font-bold">Staff</h1>
      <section aria-labelledby="staff-list" className="card overflow-x-auto p-4">
        <h2 id="staff-list" className="mb-3 text-lg font-semibold">
          People with access to the bench
        </h2>
        <TableScroll label="Staff">
          <table className="dense-table">
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">E-mail</th>
                <th scope="col">Role</th>
                <th scope="col">Status</th>
                <th scope="col">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {staff.map((s) => (
                <StaffRow
                  key={s.id}
                  person={{ id: s.id, name: s.name, email: s.email, role: isRole(s.role) ? s.role : "customer", active: !s.banned }}
                  self={s.id === viewer.id}
                />
              ))}
            </tbody>
          </table>
        </TableScroll>
      </section>
      <section aria-labelledby="bench-time" className="card space-y-4 p-4 [overflow-wrap:anywhere]">
        <div>
          <h2 id="bench-time" className="text-lg font-semibold">
            Bench time
          </h2>
          <p className="text-sm text-bakelite-muted">
            The hours each person spends at the bench and their days off. Owners&apos; expected bench dates and the backlog in weeks are
            worked out from these; a technician whose week is not set counts six hours a day, Monday to Friday.
          </p>
        </div>
        {bench.map((p) => (
          <details key={p.id} className="rounded-card border border-bakelite-muted/40 p-3">
            <summary className="cursor-pointer font-semibold">
              {p.name}: {Math.round((p.week.reduce((a, b) => a + b, 0) / 60) * 10) / 10} h a week
              {p.daysOff.length ? `, ${p.daysOff.length} day${p.daysOff.length === 1 ? "" : "s"} off listed` : ""}
              {p.assumed && p.role === "technician" ? " (assumed)" : ""}
            </summary>
            <div className="mt-3">
              <BenchWeekForm person={{ id: p.id, name: p.name, assumed: p.assumed, minutes: p.week, daysOff: p.daysOff }} />
            </div>
          </details>
        ))}
      </section>
      <section aria-labelledby="invite" className="card max-w-xl p-4">
        <h2 id="invite" className="mb-3 text-lg font-semibold">
          Invite someone
        </h2>
        <InviteForm />
      </section>
    </div>
  );
}
