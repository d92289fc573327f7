import { createRouteHandler } from "uploadthing/next";
import type { NextRequest } from "next/server";
import { assertSameOrigin, errorResponse, readJson } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { uploadRouter } from "@/lib/server/uploads/router";

export const dynamic = "force-dynamic";

// Warnings and errors only: at its default level the SDK prints a JSON line per request, signed URLs included.
const handler = createRouteHandler({ router: uploadRouter, config: { handleDaemonPromise: "await", logLevel: "Warning" } });

export const GET = handler.GET;

// The browser's upload request is a small JSON document (file names, sizes, types); the SDK's decoder fails
// with a 500 on deeply nested junk, so anything nested deeper than this is refused before it gets there.
const MAX_DEPTH = 16;

function deeperThan(value: unknown, limit: number): boolean {
  const stack: [unknown, number][] = [[value, 0]];
  while (stack.length) {
    const [v, depth] = stack.pop()!;
    if (depth > limit) return true;
    if (v && typeof v === "object") for (const child of Object.values(v)) stack.push([child, depth + 1]);
  }
  return false;
}

// The browser's upload request must come from our pages; the upload service's callbacks carry an HMAC
// signature over the body, which the SDK verifies instead.
export async function POST(request: NextRequest): Promise<Response> {
  if (!request.headers.get("uploadthing-hook")) {
    try {
      assertSameOrigin(request);
      const body = await readJson(request.clone());
      if (deeperThan(body, MAX_DEPTH)) throw new AppError("invalid_input", "The upload request was not understood.");
    } catch (error) {
      return errorResponse(error);
    }
  }
  const res = await handler.POST(request);
  // The SDK answers some malformed requests (an empty body, say) with a bare status: give them our error shape.
  if (res.status >= 400 && res.status < 500 && !(res.headers.get("content-type") ?? "").includes("json")) {
    return errorResponse(
      new AppError(res.status === 413 ? "payload_too_large" : "invalid_input", "The upload request was not understood."),
    );
  }
  return res;
}
