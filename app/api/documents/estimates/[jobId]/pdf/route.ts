import { getJobForCustomer } from "@/db/queries/jobs";
import { jobNumber } from "@/lib/engine/jobs/states";
import { can } from "@/lib/engine/permissions";
import { AppError } from "@/lib/server/errors";
import { renderMoneyPdfOffThread } from "@/lib/server/pdf/certificate-pdf-pool";
import { pdfDownload } from "@/lib/server/pdf/pdf-response";
import { route } from "@/lib/server/route-handler";
import { isUuid } from "@/lib/server/services/certificates";
import { estimateContent } from "@/lib/server/services/documents";

export const runtime = "nodejs";

// The job's newest estimate revision, printable: the set owner their own job's, the office any.
export const GET = route<{ jobId: string }>({ permission: "document.download", hideFromVisitors: true }, async ({ viewer, params }) => {
  if (!isUuid(params.jobId)) throw new AppError("not_found", "That job was not found.");
  const office = can(viewer.role, "office.use");
  const job = office ? { id: params.jobId } : await getJobForCustomer({ jobId: params.jobId, customerId: viewer.id });
  if (!job) throw new AppError("not_found", "That job was not found.");
  const content = await estimateContent(params.jobId, { shipTo: null });
  if (!content) throw new AppError("not_found", "This job has no estimate yet.");
  const number = content.facts.find((f) => f.label === "Job")?.value ?? jobNumber(0);
  return pdfDownload(() => renderMoneyPdfOffThread(content), `estimate-${number}.pdf`);
});
