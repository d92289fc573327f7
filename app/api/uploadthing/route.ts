import { createRouteHandler } from "uploadthing/next";
import type { NextRequest } from "next/server";
import { assertSameOrigin, errorResponse } from "@/lib/api";
import { uploadRouter } from "@/lib/uploads/router";

export const dynamic = "force-dynamic";

const handler = createRouteHandler({ router: uploadRouter, config: { handleDaemonPromise: "await" } });

export const GET = handler.GET;

// The browser's upload request must come from our pages; the upload service's callbacks carry an HMAC
// signature over the body, which the SDK verifies instead.
export async function POST(request: NextRequest): Promise<Response> {
  if (!request.headers.get("uploadthing-hook")) {
    try {
      assertSameOrigin(request);
    } catch (error) {
      return errorResponse(error);
    }
  }
  return handler.POST(request);
}
