import { getCertificateById, getCertificateForCustomer } from "@/db/queries/certificates";
import { route } from "@/lib/server/route-handler";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { renderCertificatePdfOffThread } from "@/lib/server/pdf/certificate-pdf-pool";
import { pdfDownload } from "@/lib/server/pdf/pdf-response";
import { can } from "@/lib/engine/permissions";
import { formatDate } from "@/lib/engine/dates";
import { shopTimeZone } from "@/lib/server/services/shop";
import { certificateStatus, isUuid } from "@/lib/server/services/certificates";

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
  const input = {
    document,
    verifyUrl: `${env().APP_URL.replace(/\/$/, "")}/verify/${row.code}`,
    keyId: row.keyId,
    issuedAt: row.issuedAt,
    status: {
      revoked:
        status === "revoked" && row.revokedAt
          ? { reason: row.revokeReason ?? "", on: formatDate(row.revokedAt, { timeZone: await shopTimeZone() }) }
          : null,
      supersededByCode: newer?.code ?? null,
    },
  };
  return pdfDownload(() => renderCertificatePdfOffThread(input), `certificate-${row.code}.pdf`);
});
