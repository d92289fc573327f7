import { toNextJsHandler } from "better-auth/next-js";
import { auth } from "@/lib/server/auth";
import { CLIENT_ADDRESS_HEADER, clientAddress } from "@/lib/server/client-address";
import { endSessionPastLifetime } from "@/lib/server/session";

// The sign-in service learns the client's address only from the trusted proxies (never from a header the
// client wrote itself): its limiter and its audit rows read the header set here.
async function withClientAddress(request: Request): Promise<Request> {
  const headers = new Headers(request.headers);
  headers.delete(CLIENT_ADDRESS_HEADER);
  const address = clientAddress(request.headers);
  if (address) headers.set(CLIENT_ADDRESS_HEADER, address);
  const body = request.method === "GET" || request.method === "HEAD" ? undefined : await request.arrayBuffer();
  return new Request(request.url, { method: request.method, headers, body, signal: request.signal });
}

export async function GET(request: Request) {
  await endSessionPastLifetime(request.headers);
  return toNextJsHandler(auth()).GET(await withClientAddress(request));
}

export async function POST(request: Request) {
  await endSessionPastLifetime(request.headers);
  return toNextJsHandler(auth()).POST(await withClientAddress(request));
}
