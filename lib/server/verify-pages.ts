import "server-only";
import { createHmac, timingSafeEqual } from "node:crypto";
import { env } from "./env";

// The public verification page, rendered once per certificate version and served from memory.
//
// A certificate's signed content never changes; what a buyer sees changes only when its row does (revoked,
// superseded, or altered behind the shop's back), when the shop's settings do (the revocation date is printed
// in the shop's time zone) or when its term runs out. So the page is rendered by the app itself (the ordinary
// page at /verify/<code>/sheet, which checks the signature as it renders) and kept here under code + certificate
// row version + shop settings version and zone + day. Every view reads those stamps first (one indexed query),
// so any change to either row, by this instance, another one or by hand in SQL, is seen by the very next view.
//
// The kept HTML carries no scripts: the page needs none, and scripts would need the nonce of each response's
// Content Security Policy (proxy.ts). It is rendered as for a visitor who is not signed in.

/** The request header by which the app asks itself for the page to keep. */
export const VERIFY_RENDER_HEADER = "x-bandedge-verify-render";

const MAX_PAGES = 500;
const RENDER_TIMEOUT_MS = 10_000;

let token: string | undefined;
function renderToken(): string {
  // Derived from the app's secret so every instance accepts another's render request, and no one else can.
  token ??= createHmac("sha256", env().BETTER_AUTH_SECRET).update("bandedge verification page render").digest("base64url");
  return token;
}

/** True when the request is the app asking itself to render the page to keep. */
export function isVerifyRenderRequest(h: Headers): boolean {
  const given = Buffer.from(h.get(VERIFY_RENDER_HEADER) ?? "");
  const expected = Buffer.from(renderToken());
  return given.length === expected.length && timingSafeEqual(given, expected);
}

/** Removes every script (and script preload) from a rendered page: what is left is plain HTML and CSS. */
export function withoutScripts(html: string): string {
  return html
    .replace(/<script\b[^>]*>[\s\S]*?<\/script>/gi, "")
    .replace(/<link\b[^>]*\bas="script"[^>]*>/gi, "")
    .replace(/<link\b[^>]*\brel="modulepreload"[^>]*>/gi, "")
    .replace(/\snonce="[^"]*"/gi, "");
}

const escapeAttr = (v: string) => v.replace(/&/g, "&amp;").replace(/"/g, "&quot;").replace(/</g, "&lt;");

/**
 * The framework announces a page's fonts in a Link response header (rel=preload) rather than in its HTML, and
 * a kept page is served without that header: the same preloads as <link> tags in its head, so the fonts are
 * fetched at once and do not arrive after the first paint and move the text. Only same-origin preloads of
 * fonts, styles and images are carried over; a nonce is left behind (it belonged to the render's response).
 */
export function withPreloads(html: string, linkHeader: string | null): string {
  if (!linkHeader) return html;
  const tags: string[] = [];
  for (const entry of linkHeader.split(/,\s*(?=<)/)) {
    const m = /^\s*<([^>]*)>(.*)$/.exec(entry);
    if (!m || !m[1]!.startsWith("/") || m[1]!.startsWith("//")) continue;
    const params = new Map<string, string>();
    for (const part of m[2]!.split(";")) {
      const eq = part.indexOf("=");
      const name = (eq < 0 ? part : part.slice(0, eq)).trim().toLowerCase();
      if (name)
        params.set(
          name,
          eq < 0
            ? ""
            : part
                .slice(eq + 1)
                .trim()
                .replace(/^"(.*)"$/, "$1"),
        );
    }
    const as = params.get("as") ?? "";
    if (params.get("rel")?.toLowerCase() !== "preload" || !["font", "style", "image"].includes(as)) continue;
    const type = params.get("type");
    tags.push(
      `<link rel="preload" href="${escapeAttr(m[1]!)}" as="${as}"${params.has("crossorigin") ? ' crossorigin=""' : ""}${type ? ` type="${escapeAttr(type)}"` : ""}/>`,
    );
  }
  if (tags.length === 0 || !html.includes("</head>")) return html;
  return html.replace("</head>", `${tags.join("")}</head>`);
}

// Insertion-ordered Map as a small LRU: a hit moves the entry to the end, the oldest goes first.
const pages = new Map<string, string>();
const rendering = new Map<string, Promise<string>>();

function remember(key: string, html: string) {
  pages.delete(key);
  pages.set(key, html);
  while (pages.size > MAX_PAGES) pages.delete(pages.keys().next().value!);
}

async function render(path: string): Promise<string> {
  const base = env().APP_INTERNAL_URL ?? env().APP_URL;
  const res = await fetch(new URL(path, base), {
    headers: { [VERIFY_RENDER_HEADER]: renderToken(), accept: "text/html" },
    redirect: "manual",
    cache: "no-store",
    signal: AbortSignal.timeout(RENDER_TIMEOUT_MS),
  });
  const body = await res.text();
  if (res.status !== 200) throw new Error(`rendering ${path} answered ${res.status}`);
  return withPreloads(withoutScripts(body), res.headers.get("link"));
}

/**
 * The page for `key`, rendered from `path` at most once at a time. `stillCurrent`, asked after the render,
 * says whether the source is unchanged since the key was made; only then is the page kept.
 */
export async function keptPage(key: string, path: string, stillCurrent: () => Promise<boolean> = async () => true): Promise<string> {
  const hit = pages.get(key);
  if (hit !== undefined) {
    pages.delete(key);
    pages.set(key, hit);
    return hit;
  }
  let pending = rendering.get(key);
  if (!pending) {
    pending = (async () => {
      const html = await render(path);
      if (await stillCurrent()) remember(key, html);
      return html;
    })().finally(() => rendering.delete(key));
    rendering.set(key, pending);
  }
  return pending;
}

/** Drops every kept page of a certificate (revoked or reissued): nothing of it is served from memory again. */
export function forgetVerifyPages(code: string) {
  for (const key of pages.keys()) if (key.startsWith(`cert:${code}:`)) pages.delete(key);
}
