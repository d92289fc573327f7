import { CertificateStatusBadge } from "@/components/warranty/certificate-status";
import { listCertificatesForJobOfCustomer } from "@/db/queries/certificates";
import { certificateStatus } from "@/lib/server/services/certificates";
import { formatDay } from "@/lib/engine/dates";

/** For the owner's job page: the job's certificates with their PDF download. Renders nothing before return. */
export async function JobCertificates({ jobId, customerId }: { jobId: string; customerId: string }) {
  const rows = await listCertificatesForJobOfCustomer({ jobId, customerId });
  if (rows.length === 0) return null;
  return (
    <section aria-labelledby="job-certificates" className="card space-y-2 p-5">
      <h2 id="job-certificates" className="text-xl font-semibold">
        Warranty certificate
      </h2>
      <ul className="space-y-2">
        {rows.map((c) => {
          const { status, document: d } = certificateStatus(c);
          return (
            <li key={c.id} className="flex flex-wrap items-center gap-3">
              <span className="figure text-sm">{c.code}</span>
              <CertificateStatusBadge status={status} />
              {d ? <span className="text-sm">until {formatDay(d.warranty.endsOn)}</span> : null}
              <a className="btn-secondary" href={`/api/certificates/${c.id}/pdf`}>
                Download the certificate (PDF)
              </a>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
