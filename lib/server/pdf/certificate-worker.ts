import "server-only";
import { renderCertificatePdf, type CertificatePdfInput } from "@/lib/server/pdf/certificate-pdf";
import { renderMoneyPdf, type MoneyPdfTask } from "@/lib/server/pdf/money-pdf";

// The entry of the PDF worker threads (see lib/pdf/render-pool.ts). It is bundled on its own by
// scripts/build-pdf-worker.mjs during `next build`, so nothing here may rely on Next's bundler.
// Certificates come as they are; receipts, invoices and estimates come marked { kind: "money" }.
export default async function renderCertificateTask(input: CertificatePdfInput | MoneyPdfTask): Promise<Uint8Array<ArrayBuffer>> {
  if ("kind" in input && input.kind === "money") return new Uint8Array(await renderMoneyPdf(input.content));
  return new Uint8Array(await renderCertificatePdf(input as CertificatePdfInput));
}
