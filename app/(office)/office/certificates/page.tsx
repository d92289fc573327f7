import type { Metadata } from "next";
import Link from "next/link";
import { CertificateActions } from "@/components/warranty/certificate-actions";
import { CertificateStatusBadge } from "@/components/warranty/certificate-status";
import { listCertificatesForStaff } from "@/db/queries/certificates";
import { jobNumber } from "@/lib/engine/jobs/states";
import { can } from "@/lib/engine/permissions";
import { certificateStatus } from "@/lib/server/services/certificates";
import { requirePermission } from "@/lib/server/session";
import { formatDay } from "@/lib/engine/dates";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata: Metadata = { title: "Certificates" };

export default async function OfficeCertificatesPage() {
  const viewer = await requirePermission("certificate.list", "/office/certificates");
  const rows = await listCertificatesForStaff();
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-3xl font-bold">Certificates</h1>
        <p className="text-bakelite-soft">
          Every certificate issued, its status as the public page shows it, and corrections or revocations.
        </p>
      </div>
      {rows.length === 0 ? (
        <p>No certificates have been issued yet.</p>
      ) : (
        <TableScroll label="Certificates">
          <table className="dense-table w-full">
            <thead>
              <tr>
                <th scope="col">Code</th>
                <th scope="col">Set</th>
                <th scope="col">Owner</th>
                <th scope="col">Job</th>
                <th scope="col">Term ends</th>
                <th scope="col">Status</th>
                <th scope="col">Actions</th>
              </tr>
            </thead>
            <tbody>
              {rows.map(({ certificate: c, jobNumber: n, customerName }) => {
                const { status, document: d } = certificateStatus(c);
                const live = status === "valid" || status === "expired";
                return (
                  <tr key={c.id}>
                    <td className="figure whitespace-nowrap">
                      <Link href={`/verify/${c.code}`}>{c.code}</Link>
                    </td>
                    <td>{d ? `${d.set.maker} ${d.set.model}` : "—"}</td>
                    <td>{customerName}</td>
                    <td className="figure">{jobNumber(n)}</td>
                    <td className="figure">{formatDay(d?.warranty.endsOn, { style: "compact" })}</td>
                    <td>
                      <CertificateStatusBadge status={status} />
                      {c.revokeReason ? <p className="text-xs">{c.revokeReason}</p> : null}
                    </td>
                    <td>
                      <a href={`/api/certificates/${c.id}/pdf`} className="inline-block min-h-6 min-w-6 py-0.5">
                        PDF<span className="sr-only"> of {c.code}</span>
                      </a>
                      <CertificateActions
                        id={c.id}
                        canRevoke={live && can(viewer.role, "certificate.revoke")}
                        canReissue={live && can(viewer.role, "certificate.reissue")}
                      />
                    </td>
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
