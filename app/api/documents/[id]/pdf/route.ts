import { getMoneyDocumentForCustomer, getMoneyDocumentForOffice } from "@/db/queries/documents";
import { can } from "@/lib/engine/permissions";
import { AppError } from "@/lib/server/errors";
import { renderMoneyPdfOffThread } from "@/lib/server/pdf/certificate-pdf-pool";
import { pdfDownload } from "@/lib/server/pdf/pdf-response";
import { route } from "@/lib/server/route-handler";
import { isUuid } from "@/lib/server/services/certificates";
import { moneyDocumentContent } from "@/lib/server/services/documents";

export const runtime = "nodejs";

// A receipt, refund note or invoice: the set owner downloads those of their own jobs, the office any;
// anyone else's answers not-found.
export const GET = route<{ id: string }>({ permission: "document.download", hideFromVisitors: true }, async ({ viewer, params }) => {
  if (!isUuid(params.id)) throw new AppError("not_found", "That document was not found.");
  const doc = can(viewer.role, "office.use")
    ? await getMoneyDocumentForOffice({ documentId: params.id })
    : await getMoneyDocumentForCustomer({ documentId: params.id, customerId: viewer.id });
  if (!doc) throw new AppError("not_found", "That document was not found.");
  // The job's ship-to address is not recorded yet: the block prints "collected from the shop".
  const content = await moneyDocumentContent(doc, { shipTo: null });
  return pdfDownload(() => renderMoneyPdfOffThread(content), `${doc.number}.pdf`);
});
