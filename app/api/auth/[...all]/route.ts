import { toNextJsHandler } from "better-auth/next-js";
import { auth } from "@/lib/server/auth";
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

export async function GET(request: Request) {
  await endSessionPastLifetime(request.headers);
  const prepared = await withClientAddress(request);
  return prepared instanceof Response ? prepared : toNextJsHandler(auth()).GET(prepared);
}

export async function POST(request: Request) {
  await endSessionPastLifetime(request.headers);
  const prepared = await withClientAddress(request);
  return prepared instanceof Response ? prepared : toNextJsHandler(auth()).POST(prepared);
}
