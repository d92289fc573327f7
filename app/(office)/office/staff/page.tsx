import type { Metadata } from "next";
import { listStaff } from "@/db/queries/staff";
import { isRole } from "@/lib/engine/permissions";
import { requirePermission } from "@/lib/server/session";
import { InviteForm, StaffRow } from "./_components/staff-controls";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata: Metadata = { title: "Staff" };

export default async function StaffPage() {
  const viewer = await requirePermission("staff.manage", "/office/staff");
  const staff = await listStaff();
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
      <section aria-labelledby="invite" className="card max-w-xl p-4">
        <h2 id="invite" className="mb-3 text-lg font-semibold">
          Invite someone
        </h2>
        <InviteForm />
      </section>
    </div>
  );
}
