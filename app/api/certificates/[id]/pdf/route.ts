import { getCertificateById, getCertificateForCustomer } from "@/db/queries/certificates";
import { route } from "@/lib/api";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { renderCertificatePdf } from "@/lib/pdf/certificate-pdf";
import { can } from "@/lib/permissions";
import { certificateStatus, isUuid } from "@/lib/services/certificates";

export const runtime = "nodejs";

// The holder downloads their own certificate, staff any; everyone else gets not-found.
export const GET = route<{ id: string }>({ permission: "certificate.download" }, async ({ viewer, params }) => {
  if (!isUuid(params.id)) throw new AppError("not_found", "That certificate was not found.");
  const row = can(viewer.role, "bench.use")
    ? await getCertificateById({ certificateId: params.id })
    : await getCertificateForCustomer({ certificateId: params.id, customerId: viewer.id });
  if (!row) throw new AppError("not_found", "That certificate was not found.");
  const { status, document } = certificateStatus(row);
  if (!document) throw new AppError("conflict", "This certificate cannot be verified, so it cannot be printed. Please contact the shop.");
  const newer = row.supersededById ? await getCertificateById({ certificateId: row.supersededById }) : null;
  const pdf = await renderCertificatePdf({
    document,
    verifyUrl: `${env().APP_URL.replace(/\/$/, "")}/verify/${row.code}`,
    keyId: row.keyId,
    issuedAt: row.issuedAt,
    status: {
      revoked: status === "revoked" && row.revokedAt ? { reason: row.revokeReason ?? "", on: row.revokedAt.toISOString().slice(0, 10) } : null,
      supersededByCode: newer?.code ?? null,
    },
  });
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `attachment; filename="certificate-${row.code}.pdf"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
});
