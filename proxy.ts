import { NextResponse, type NextRequest } from "next/server";
import { databaseAnswersRecently } from "@/db";
import { env } from "@/lib/server/env";

// Runs before routing. It turns away addresses that cannot be decoded (a broken percent-escape), which
// would otherwise surface as a server error, answers pages with 503 while the database is unreachable, and
// sets the Content Security Policy with a fresh nonce; authorization is never decided here.
export async function proxy(request: NextRequest) {
  try {
    decodeURIComponent(request.nextUrl.pathname);
  } catch {
    return new NextResponse("This address is not valid.", { status: 400, headers: { "content-type": "text/plain; charset=utf-8" } });
  }

  // --- Database unavailable: pages answer 503 with a clear message ---
  if (isPageRequest(request) && !(await databaseAnswersRecently())) return databaseUnavailablePage();

  // --- Content Security Policy (nonce, strict-dynamic) and HSTS ---
  return withSecurityHeaders(request);
}

export const config = { matcher: "/((?!_next/static|_next/image).*)" };

// ---------------------------------------------------------------------------------------------
// Database unavailable. Pages run many queries; rather than fail halfway into the framework's generic error,
// they are answered up front while PostgreSQL does not answer a trivial query (db/index.ts shares one probe a
// second among the requests that arrive meanwhile).

const RETRY_AFTER_SECONDS = 15;

function isPageRequest(request: NextRequest): boolean {
  if (request.method !== "GET" && request.method !== "HEAD") return false;
  const path = request.nextUrl.pathname;
  if (path.startsWith("/api/") || path.startsWith("/_next/")) return false;
  if (request.headers.get("next-router-prefetch") || request.headers.get("rsc")) return false;
  return !/\.[a-z0-9]+$/i.test(path); // icons and other files
}

function databaseUnavailablePage(): NextResponse {
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Back shortly · Kestrel Lane Wireless</title></head>
<body style="font-family:system-ui,sans-serif;max-width:36rem;margin:4rem auto;padding:0 1rem;line-height:1.5;color:#2a2320">
<main><h1>Back shortly</h1>
<p>The workshop's records cannot be reached right now, so this page cannot be shown. Nothing you sent has been lost.</p>
<p>Please try again in a minute.</p></main></body></html>`;
  return new NextResponse(html, {
    status: 503,
    headers: {
      "content-type": "text/html; charset=utf-8",
      "retry-after": String(RETRY_AFTER_SECONDS),
      "cache-control": "no-store",
    },
  });
}

// ---------------------------------------------------------------------------------------------
// Content Security Policy. Scripts run only with this response's nonce (Next puts it on its own scripts when
// it finds it in the request's policy) or when loaded by such a script ('strict-dynamic'); images and
// connections go only to the app and to the upload service the app uses.

function uploadSources(): { connect: string[]; img: string[] } {
  const settings = env();
  const ingest = settings.UPLOADTHING_INGEST_URL ? [new URL(settings.UPLOADTHING_INGEST_URL).origin] : ["https://*.ingest.uploadthing.com"];
  let files = ["https://*.ufs.sh", "https://utfs.io"];
  if (settings.UPLOADTHING_UFS_HOST) {
    const host = settings.UPLOADTHING_UFS_HOST;
    const local = /^(localhost|127\.0\.0\.1)(:|$)/.test(host);
    files = [`${local ? "http" : "https"}://${host}`];
  }
  return { connect: ingest, img: files };
}

export function contentSecurityPolicy(nonce: string): string {
  const dev = env().NODE_ENV === "development";
  const uploads = uploadSources();
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    `img-src 'self' data: blob: ${uploads.img.join(" ")}`,
    "font-src 'self'",
    `connect-src 'self' ${uploads.connect.join(" ")}`,
    "form-action 'self'",
    "frame-ancestors 'none'",
    "object-src 'none'",
    "base-uri 'none'",
  ].join("; ");
}

function withSecurityHeaders(request: NextRequest): NextResponse {
  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(18))).toString("base64");
  const policy = contentSecurityPolicy(nonce);
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("x-nonce", nonce);
  requestHeaders.set("content-security-policy", policy);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("content-security-policy", policy);
  // Browsers heed HSTS only on HTTPS answers (and ignore it over plain HTTP): sent when the app's own
  // address is HTTPS or the TLS-terminating proxy in front says the request came over HTTPS.
  const https = new URL(env().APP_URL).protocol === "https:" || request.headers.get("x-forwarded-proto") === "https";
  if (https) {
    response.headers.set("strict-transport-security", "max-age=63072000; includeSubDomains");
  }
  return response;
}
