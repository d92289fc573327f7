import "server-only";
import { json } from "@/lib/server/route-handler";
import { certificatePdfFailure } from "@/lib/server/pdf/certificate-pdf-pool";
import { RenderPoolError } from "@/lib/server/pdf/render-pool";

/** A rendered PDF as a download; a busy or slow pool answers 503 with Retry-After, as for certificates. */
export async function pdfDownload(render: () => Promise<Uint8Array<ArrayBuffer>>, filename: string): Promise<Response> {
  let pdf: Uint8Array<ArrayBuffer>;
  try {
    pdf = await render();
  } catch (e) {
    if (!(e instanceof RenderPoolError)) throw e;
    const { error, retryAfterSeconds } = certificatePdfFailure(e);
    if (retryAfterSeconds === null) throw error;
    return json(error.toJSON(), { status: error.status, headers: { "retry-after": String(retryAfterSeconds) } });
  }
  return new Response(pdf, {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `attachment; filename="${filename}"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
}
