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
