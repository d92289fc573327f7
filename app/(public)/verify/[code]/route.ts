import type { NextRequest } from "next/server";
import { countVerifyGuess, getVerifyPageStamp, type VerifyPageStamp } from "@/db/queries/certificates";
import { normaliseCertificateCode } from "@/lib/engine/certificates";
import { todayIso } from "@/lib/engine/certificates/document";
import { EngineError } from "@/lib/engine/engine-error";
import { clientAddressKey } from "@/lib/server/client-address";
import { VERIFY_GUESS_LIMIT_PER_MINUTE } from "@/lib/server/services/certificates";
import { keptPage } from "@/lib/server/verify-pages";

// The public certificate check. A certificate that exists is served from the page kept for its row version
// (lib/server/verify-pages.ts), as often as anyone likes: buyers and sellers open it freely. Codes that do not
// exist are what guessing looks like, so those are counted per client address, and past the limit the answer
// is 429 with Retry-After and a page that says what happened.

const WINDOW_SECONDS = 60;

function page(html: string, status: number, extra: Record<string, string> = {}): Response {
  return new Response(html, {
    status,
    headers: { "content-type": "text/html; charset=utf-8", "cache-control": "no-store", ...extra },
  });
}

export async function GET(request: NextRequest, { params }: { params: Promise<{ code: string }> }) {
  // A link to this address inside the app (the office's certificate list, the portal, a superseded
  // certificate's notice) is prefetched and followed by the client router, which asks for a React Server
  // Components payload. This address answers only with a whole document, so the router is told, by an answer
  // without a body, to load it as one; an HTML body here would be left unread and keep the connection open.
  if (request.headers.get("rsc") !== null) return new Response(null, { status: 204, headers: { "cache-control": "no-store" } });
  const { code: rawCode } = await params;
  let code: string;
  try {
    code = normaliseCertificateCode(decodeURIComponent(rawCode));
  } catch (e) {
    // A malformed escape (URIError) is just as much "not a code" as a wrong length.
    if (!(e instanceof EngineError) && !(e instanceof URIError)) throw e;
    return page(await keptPage("notice:malformed", "/verify/not-a-code/sheet"), 200);
  }
  if (code !== rawCode) return new Response(null, { status: 307, headers: { location: `/verify/${code}`, "cache-control": "no-store" } });

  const stamp = await getVerifyPageStamp({ code });
  if (stamp === null) {
    const { count, windowStartedAt } = await countVerifyGuess({ ip: clientAddressKey(request.headers), windowSeconds: WINDOW_SECONDS });
    if (count > VERIFY_GUESS_LIMIT_PER_MINUTE) {
      const retryAfter = Math.max(1, Math.ceil((windowStartedAt + WINDOW_SECONDS * 1000 - Date.now()) / 1000));
      return page(await keptPage("notice:limited", "/verify/notice/sheet?notice=limited"), 429, { "retry-after": String(retryAfter) });
    }
    return page(await keptPage("notice:unknown", "/verify/notice/sheet?notice=unknown"), 404);
  }
  // Every input of the rendered page is in the key: the certificate row's version (revocation, reissue, any
  // change by hand), the shop settings' version and time zone (the revocation date is printed in the shop's
  // zone), and the day (a certificate's term ends at a day's turn without its row changing).
  const key = pageKey(code, stamp);
  const html = await keptPage(key, `/verify/${code}/sheet`, async () => {
    const now = await getVerifyPageStamp({ code });
    return now !== null && pageKey(code, now) === key;
  });
  return page(html, 200);
}

function pageKey(code: string, stamp: VerifyPageStamp): string {
  return `cert:${code}:${stamp.certificate}:${stamp.shop}:${stamp.timeZone}:${todayIso()}`;
}
