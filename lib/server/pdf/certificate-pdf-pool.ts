import "server-only";
import { availableParallelism } from "node:os";
import { isAbsolute, resolve } from "node:path";
import { AppError } from "@/lib/server/errors";
import type { CertificatePdfInput } from "@/lib/server/pdf/certificate-pdf";
import type { MoneyPdfContent, MoneyPdfTask } from "@/lib/server/pdf/money-pdf";
import { RenderPool, RenderPoolError } from "@/lib/server/pdf/render-pool";

// Rendering a certificate takes a couple of hundred milliseconds of pure CPU; on the request thread that
// stalls every other request. It runs in a small pool of worker threads instead: one per core but one,
// so the main thread keeps a core; a short line waits behind them, and beyond that callers are told to
// retry rather than queued without end.
export const CERTIFICATE_PDF_THREADS = Math.max(1, availableParallelism() - 1);
export const CERTIFICATE_PDF_MAX_QUEUE = 8 * CERTIFICATE_PDF_THREADS;
export const CERTIFICATE_PDF_TIMEOUT_MS = 15_000;

/**
 * The worker bundle's path, fixed at build time: next.config.mjs sets BANDEDGE_PDF_WORKER to the file it
 * builds into the dist dir (relative to the project root, which is where `next start` runs).
 */
export function certificateWorkerFile(): string {
  const file = process.env.BANDEDGE_PDF_WORKER;
  if (!file) throw new RenderPoolError("failed", "BANDEDGE_PDF_WORKER is not set: the app was not built with next.config.mjs");
  return isAbsolute(file) ? file : resolve(process.cwd(), file);
}

// Receipts, invoices and estimates share the threads (and their bounds) with certificates.
type CertificatePool = RenderPool<CertificatePdfInput | MoneyPdfTask, Uint8Array<ArrayBuffer>>;
// One pool per server process, kept across module reloads in development.
const holder = globalThis as typeof globalThis & { bandedgeCertificatePdfPool?: CertificatePool };

function certificatePool(): CertificatePool {
  holder.bandedgeCertificatePdfPool ??= new RenderPool<CertificatePdfInput | MoneyPdfTask, Uint8Array<ArrayBuffer>>({
    filename: certificateWorkerFile(),
    threads: CERTIFICATE_PDF_THREADS,
    maxQueue: CERTIFICATE_PDF_MAX_QUEUE,
    timeoutMs: CERTIFICATE_PDF_TIMEOUT_MS,
    niceIncrement: 10,
    maxHeapMb: 512,
  });
  return holder.bandedgeCertificatePdfPool;
}

/** The certificate as a PDF, rendered on a worker thread; throws RenderPoolError when it cannot be had. */
export async function renderCertificatePdfOffThread(input: CertificatePdfInput): Promise<Uint8Array<ArrayBuffer>> {
  return certificatePool().run(input);
}

/** A receipt, refund note, invoice or estimate as a PDF, on the same worker threads. */
export async function renderMoneyPdfOffThread(content: MoneyPdfContent): Promise<Uint8Array<ArrayBuffer>> {
  return certificatePool().run({ kind: "money", content });
}

/**
 * What to tell the person asking for the PDF. Busy and slow renders answer 503 with Retry-After (the
 * next try usually succeeds); a render that failed answers 500, and its cause goes to the log.
 */
export function certificatePdfFailure(e: RenderPoolError): { error: AppError; retryAfterSeconds: number | null } {
  if (e.reason === "busy") {
    return {
      error: new AppError("unavailable", "Many certificates are being printed right now. Please try again in a few seconds."),
      retryAfterSeconds: 2,
    };
  }
  if (e.reason === "timeout") {
    console.warn("[bandedge] certificate PDF timed out", e.message);
    return {
      error: new AppError("unavailable", "The certificate PDF took too long to prepare. Please try again in a moment."),
      retryAfterSeconds: 5,
    };
  }
  console.error("[bandedge] certificate PDF failed", e, e.cause);
  return {
    error: new AppError("internal", "The certificate PDF could not be prepared. Please try again; if it keeps failing, contact the shop."),
    retryAfterSeconds: null,
  };
}
