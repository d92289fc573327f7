import { formatDate } from "@/lib/engine/dates";
import { DOCUMENT_TITLE } from "@/lib/engine/documents/numbering";
import { documentsOfJob, latestRevisionNumber } from "@/lib/server/services/documents";
import { shopTimeZone } from "@/lib/server/services/shop";

/**
 * For the owner's job page (ownership checked by the page): the printable estimate, and the receipts, refund
 * notes and invoice issued for the job. Renders nothing before the first estimate.
 */
export async function JobDocuments({ jobId }: { jobId: string }) {
  const [revision, docs, timeZone] = await Promise.all([latestRevisionNumber(jobId), documentsOfJob(jobId), shopTimeZone()]);
  if (revision === null && docs.length === 0) return null;
  return (
    <section aria-labelledby="job-documents" className="card space-y-2 p-5">
      <h2 id="job-documents" className="text-xl font-semibold">
        Estimate, receipts and invoice
      </h2>
      <ul className="space-y-2 text-sm">
        {revision !== null ? (
          <li>
            <a href={`/api/documents/estimates/${jobId}/pdf`} download>
              Printable estimate, revision {revision} (PDF)
            </a>
          </li>
        ) : null}
        {docs.map((d) => (
          <li key={d.id} className="flex flex-wrap items-baseline gap-x-2">
            <a href={`/api/documents/${d.id}/pdf`} download>
              {DOCUMENT_TITLE[d.kind]} <span className="figure">{d.number}</span> (PDF)
            </a>
            <span className="text-bakelite-muted">issued {formatDate(d.issuedAt, { timeZone })}</span>
          </li>
        ))}
      </ul>
    </section>
  );
}
