import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { ClaimForm } from "@/components/warranty/claim-form";
import { getCertificateForCustomer } from "@/db/queries/certificates";
import { certificateStatus, isUuid } from "@/lib/server/services/certificates";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "Open a warranty claim" };

export default async function NewClaimPage({ searchParams }: { searchParams: Promise<{ certificate?: string }> }) {
  const viewer = await requirePermission("claim.open", "/portal/claims/new");
  const { certificate } = await searchParams;
  let setName: string | undefined;
  if (certificate) {
    // Only the holder reaches a certificate by its id; anyone else uses the code.
    const row = isUuid(certificate) ? await getCertificateForCustomer({ certificateId: certificate, customerId: viewer.id }) : null;
    if (!row) notFound();
    const { document } = certificateStatus(row);
    setName = document ? `${document.set.maker} ${document.set.model}` : "this set";
  }
  return (
    <div className="mx-auto max-w-prose space-y-4">
      <h1 className="text-3xl font-bold">Open a warranty claim</h1>
      {certificate ? null : (
        <p className="text-bakelite-soft">
          Enter the code printed on the certificate. A later owner can claim if the certificate says the warranty passes to them.
        </p>
      )}
      <ClaimForm certificateId={certificate} setName={setName} />
    </div>
  );
}
