import { describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { TestClient } from "../support/http";

describe("security headers", () => {
  it("sends a strict CSP and the usual hardening headers, and no X-Powered-By", async () => {
    const res = await new TestClient().get("/");
    expect(res.status).toBe(200);
    const csp = res.headers.get("content-security-policy") ?? "";
    expect(csp).toContain("object-src 'none'");
    expect(csp).toContain("base-uri 'none'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    expect(res.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    expect(res.headers.get("x-powered-by")).toBeNull();
  });

  it("marks private pages and JSON as no-store", async () => {
    const customer = await signedIn(DEMO.customer);
    const page = await customer.get("/portal");
    expect(page.status).toBe(200);
    expect(page.headers.get("cache-control")).toContain("no-store");
    const session = await customer.get("/api/auth/get-session");
    expect(session.headers.get("cache-control") ?? "").toContain("no-store");
  });

  it("serves no source maps", async () => {
    const html = await (await new TestClient().get("/")).text();
    const scripts = [...html.matchAll(/src="(\/_next\/static\/[^"]+\.js)"/g)].map((m) => m[1]!);
    expect(scripts.length).toBeGreaterThan(0);
    for (const src of scripts.slice(0, 5)) {
      const js = await (await new TestClient().get(src)).text();
      expect(js).not.toMatch(/sourceMappingURL=/);
      expect((await new TestClient().get(`${src}.map`)).status).toBe(404);
    }
  });

  it("refuses a state-changing auth request from another origin", async () => {
    const res = await new TestClient().post("/api/auth/sign-in/email", DEMO.customer, { headers: { origin: "http://evil.example" } });
    expect(res.status).toBe(403);
  });

  it("answers 400, not a server error, for an address with a broken percent-escape", async () => {
    for (const path of ["/verify/%E0%A4%A", "/bench/jobs/%E0%A4%A", "/portal/jobs/%zz"]) {
      const res = await new TestClient().get(path);
      expect(res.status, path).toBe(400);
    }
  });
});

// Content Security Policy Level 3 (W3C): a 'nonce-…' source allows only elements carrying that nonce, and
// 'strict-dynamic' lets those scripts load others while host and 'unsafe-inline' sources are ignored. The
// nonce must be unguessable and new for every response. HSTS: RFC 6797 (a browser ignores the header over
// plain HTTP, so it matters on HTTPS answers; a year's max-age is the common practice).
function directive(csp: string, name: string): string[] {
  const found = csp
    .split(";")
    .map((d) => d.trim().split(/\s+/))
    .find((d) => d[0] === name);
  return found ? found.slice(1) : [];
}

describe("content security policy", () => {
  it("allows scripts only by a fresh per-response nonce with strict-dynamic, and every page script carries it", async () => {
    const seen = new Set<string>();
    for (const path of ["/", "/sign-in", "/"]) {
      const res = await new TestClient().get(path);
      expect(res.status).toBe(200);
      const csp = res.headers.get("content-security-policy") ?? "";
      const scripts = directive(csp, "script-src");
      expect(scripts).toContain("'strict-dynamic'");
      expect(scripts).not.toContain("'unsafe-inline'");
      expect(scripts).not.toContain("'unsafe-eval'");
      const nonce = scripts.find((s) => s.startsWith("'nonce-"))?.slice(7, -1);
      expect(nonce, csp).toBeDefined();
      expect(Buffer.from(nonce!, "base64").length).toBeGreaterThanOrEqual(16); // 128 bits at least
      expect(seen.has(nonce!)).toBe(false);
      seen.add(nonce!);
      const html = await res.text();
      const tags = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
      expect(tags.length).toBeGreaterThan(0);
      for (const tag of tags) expect(tag, tag).toContain(`nonce="${nonce}"`);
    }
  });

  it("limits images and connections to the app and the upload service it uses", async () => {
    const csp = (await new TestClient().get("/")).headers.get("content-security-policy") ?? "";
    const uploadOrigin = new URL(process.env.UPLOADTHING_INGEST_URL!).origin;
    const fileHost = process.env.UPLOADTHING_UFS_HOST!;
    expect(directive(csp, "connect-src").sort()).toEqual(["'self'", uploadOrigin].sort());
    expect(directive(csp, "img-src").sort()).toEqual(["'self'", "blob:", "data:", `http://${fileHost}`].sort());
    for (const name of ["connect-src", "img-src", "default-src", "form-action"]) {
      for (const source of directive(csp, name)) expect(source, `${name} ${source}`).not.toMatch(/^(https?:|\*)$|:\*$/);
    }
    expect(directive(csp, "form-action")).toEqual(["'self'"]);
  });

  it("sends HSTS on answers served over HTTPS and not over plain HTTP", async () => {
    const plain = await new TestClient().get("/");
    expect(plain.headers.get("strict-transport-security")).toBeNull();
    const secure = await new TestClient().get("/", { headers: { "x-forwarded-proto": "https" } });
    const hsts = secure.headers.get("strict-transport-security") ?? "";
    expect(Number(/max-age=(\d+)/.exec(hsts)?.[1])).toBeGreaterThanOrEqual(31_536_000);
  });
});
