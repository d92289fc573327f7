import { toNextJsHandler } from "better-auth/next-js";
import { databaseReachable } from "@/db";
import { auth } from "@/lib/server/auth";
import { AppError, databaseUnavailable } from "@/lib/server/errors";
import { errorResponse } from "@/lib/server/route-handler";
import { CLIENT_ADDRESS_HEADER, clientAddress } from "@/lib/server/client-address";
import { endSessionPastLifetime } from "@/lib/server/session";

// Far above any real sign-in body; the field limits (lib/server/auth-guards.ts) answer the precise error.
const BODY_LIMIT_BYTES = 1024 * 1024;

async function readCapped(request: Request): Promise<Uint8Array<ArrayBuffer> | null> {
  if (!request.body) return new Uint8Array(new ArrayBuffer(0));
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > BODY_LIMIT_BYTES) {
      await reader.cancel();
      return null;
    }
    chunks.push(value);
  }
  const out = new Uint8Array(new ArrayBuffer(size));
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

// The sign-in service learns the client's address only from the trusted proxies (never from a header the
// client wrote itself): its limiter and its audit rows read the header set here.
async function withClientAddress(request: Request): Promise<Request | Response> {
  const headers = new Headers(request.headers);
  headers.delete(CLIENT_ADDRESS_HEADER);
  const address = clientAddress(request.headers);
  if (address) headers.set(CLIENT_ADDRESS_HEADER, address);
  if (request.method === "GET" || request.method === "HEAD") return new Request(request.url, { method: request.method, headers });
  const body = await readCapped(request);
  if (!body) return Response.json({ code: "PAYLOAD_TOO_LARGE", message: "The request is too large." }, { status: 413 });
  return new Request(request.url, { method: request.method, headers, body });
}

// The auth library answers its own failures with an empty 500; people get a JSON answer that says what
// happened instead: 503 with Retry-After when the database is not answering, a plain message otherwise.
async function guarded(request: Request, handle: (request: Request) => Promise<Response>): Promise<Response> {
  let response: Response;
  try {
    await endSessionPastLifetime(request.headers);
    const prepared = await withClientAddress(request);
    if (prepared instanceof Response) return prepared;
    response = await handle(prepared);
  } catch (error) {
    if (!(await databaseReachable())) return errorResponse(databaseUnavailable());
    return errorResponse(error);
  }
  if (response.status < 500) return response;
  if (!(await databaseReachable())) return errorResponse(databaseUnavailable());
  if (response.headers.get("content-type")?.includes("json")) return response;
  return errorResponse(new AppError("internal", "Something went wrong on our side. Please try again."));
}

export async function GET(request: Request) {
  return guarded(request, toNextJsHandler(auth()).GET);
}

export async function POST(request: Request) {
  return guarded(request, toNextJsHandler(auth()).POST);
}
