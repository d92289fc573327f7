import { describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { TestClient } from "../support/http";
import { nextTestIp } from "../support/ip";

describe("role guards on pages", () => {
  it("sends anonymous visitors to sign-in", async () => {
    const anon = new TestClient();
    for (const path of ["/portal", "/bench", "/office", "/office/staff"]) {
      const res = await anon.get(path);
      expect(res.status, path).toBeGreaterThanOrEqual(300);
      expect(res.status, path).toBeLessThan(400);
      expect(res.headers.get("location"), path).toContain("/sign-in");
    }
  });

  it("keeps customers out of the bench and the office", async () => {
    const customer = await signedIn(DEMO.customer);
    expect((await customer.get("/portal")).status).toBe(200);
    for (const path of ["/bench", "/office", "/office/staff"]) {
      expect((await customer.get(path)).status, path).toBe(404);
    }
  });

  it("lets technicians use the bench but not the office", async () => {
    const tech = await signedIn(DEMO.tech);
    expect((await tech.get("/bench")).status).toBe(200);
    for (const path of ["/office", "/office/staff", "/portal"]) {
      expect((await tech.get(path)).status, path).toBe(404);
    }
  });

  it("lets the owner into the office", async () => {
    const owner = await signedIn(DEMO.owner);
    expect((await owner.get("/office")).status).toBe(200);
    expect((await owner.get("/office/staff")).status).toBe(200);
    expect((await owner.get("/bench")).status).toBe(200);
  });

  it("answers the same for an unknown e-mail and a wrong password", async () => {
    const a = await new TestClient().post("/api/auth/sign-in/email", { email: "nobody-here@example.com", password: "whatever-long" });
    const b = await new TestClient().post("/api/auth/sign-in/email", { email: DEMO.customer.email, password: "not-the-password" });
    expect(a.status).toBe(b.status);
    expect((await a.json()).message).toBe((await b.json()).message);
  });
});

describe("sign-in rate limit (production mode)", () => {
  it("refuses a sixth attempt from one address within the window", async () => {
    const ip = nextTestIp();
    const statuses: number[] = [];
    // A throwaway e-mail: the per-account throttle must not lock a demo account used by other tests.
    const target = `limit-${Date.now()}@example.com`;
    for (let i = 0; i < 7; i++) {
      const res = await new TestClient({ ip }).post("/api/auth/sign-in/email", {
        email: target,
        password: `wrong-${i}-password`,
      });
      statuses.push(res.status);
    }
    expect(statuses.slice(0, 5).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(5)).toContain(429);
    // Another address is not affected.
    const other = await new TestClient().post("/api/auth/sign-in/email", DEMO.customer);
    expect(other.status).toBe(200);
  });
});

describe("passwords", () => {
  it("refuses a password from the common-password list", async () => {
    const res = await new TestClient().signUp("Common", `common-${Date.now()}@example.com`, "password123");
    expect(res.status).toBe(400);
    expect((await res.json()).code).toBe("PASSWORD_TOO_COMMON");
  });

  it("stores argon2id hashes", async () => {
    const { sql } = await import("../support/db");
    const [row] = await sql<{ password: string }>("select password from account where provider_id = 'credential' limit 1");
    expect(row!.password).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
  });
});
