import "server-only";
import { renderCertificatePdf, type CertificatePdfInput } from "@/lib/server/pdf/certificate-pdf";

// The entry of the PDF worker threads (see lib/pdf/render-pool.ts). It is bundled on its own by
// scripts/build-pdf-worker.mjs during `next build`, so nothing here may rely on Next's bundler.
export default async function renderCertificateTask(input: CertificatePdfInput): Promise<Uint8Array<ArrayBuffer>> {
  return new Uint8Array(await renderCertificatePdf(input));
}
