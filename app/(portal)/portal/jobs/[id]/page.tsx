import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getJobForCustomer } from "@/db/queries/jobs";
import { getPortalJobView } from "@/lib/server/services/portal-view";
import { requirePermission } from "@/lib/server/session";
import { JobCertificates } from "@/app/(portal)/portal/jobs/[id]/_components/job-certificates";
import { JobDocuments } from "./_components/job-documents";
import { JobView } from "./_components/job-view";

export const metadata: Metadata = { title: "My job" };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export default async function JobPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { id } = await params;
  const viewer = await requirePermission("portal.use", `/portal/jobs/${id}`);
  if (!UUID.test(id)) notFound();
  const owned = await getJobForCustomer({ jobId: id, customerId: viewer.id });
  if (!owned) notFound();
  const [sp, initial] = await Promise.all([searchParams, getPortalJobView({ jobId: id, customerId: viewer.id })]);
  return (
    <JobView
      jobId={id}
      initial={initial}
      justCreated={sp.new === "1"}
      paymentCancelled={sp.payment === "cancelled"}
      certificates={
        <>
          <JobDocuments jobId={id} />
          <JobCertificates jobId={id} customerId={viewer.id} />
        </>
      }
    />
  );
}
