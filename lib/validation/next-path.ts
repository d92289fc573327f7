// Where to go after signing in. The address comes from the query string, so anyone can write it: it is
// resolved with the URL parser against our own origin (the parser is what the browser will use, so
// backslashes, tabs, line breaks and protocol-relative forms are read exactly as the browser reads them)
// and kept only when it stays on that origin. Anything else falls back to the caller's default.
export function safeNextPath(next: string | null | undefined, origin: string, fallback = "/after-sign-in"): string {
  if (!next || next.length > 2048) return fallback;
  let base: URL;
  let target: URL;
  try {
    base = new URL(origin);
    target = new URL(next, base);
  } catch {
    return fallback;
  }
  if (target.origin !== base.origin) return fallback;
  // Only paths: the raw value must itself start with a single "/" (not "//", "/\" or a scheme).
  if (!/^\/(?![/\\])/.test(next.replace(/[\t\n\r]/g, ""))) return fallback;
  const path = `${target.pathname}${target.search}${target.hash}`;
  // A path that starts with "//" after normalising would be read as another host by the next parser.
  if (path.startsWith("//") || path.startsWith("/\\")) return fallback;
  return path;
}
