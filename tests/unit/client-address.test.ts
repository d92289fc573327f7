import { afterAll, beforeAll, describe, expect, it } from "vitest";

// Which X-Forwarded-For entry is the client. Reference: MDN "X-Forwarded-For", Security and privacy concerns:
// only the rightmost entries written by one's own proxies can be trusted; with a list of trusted proxies the
// client is the rightmost address that is not one of them, with a known count of proxies it is that many
// entries from the right. Anything further left was written by the client itself.
let clientAddress: (h: Headers) => string | null;
const saved = { ...process.env };

beforeAll(async () => {
  // Settings for this module only; whatever the test command set is kept and put back afterwards.
  process.env = {
    ...process.env,
    DATABASE_URL: "postgres://u:p@127.0.0.1:5432/x",
    BETTER_AUTH_SECRET: "x".repeat(40),
    CERT_SIGNING_KEY: "unused-here",
    RESEND_API_KEY: "re_unit",
    STRIPE_SECRET_KEY: "sk_test_unit",
    STRIPE_WEBHOOK_SECRET: "whsec_unit",
    BANDEDGE_LOCAL_DEMO: "1",
    TRUSTED_PROXIES: "10.0.0.0/8, 192.0.2.10, 2001:db8::/32",
    TRUSTED_PROXY_HOPS: "0",
  };
  ({ clientAddress } = await import("@/lib/server/client-address"));
});

afterAll(() => {
  process.env = saved;
});

const h = (xff: string) => new Headers({ "x-forwarded-for": xff });

describe("the client address with a list of trusted proxies", () => {
  it("skips our proxies from the right and stops at the first address that is not one", () => {
    expect(clientAddress(h("203.0.113.5"))).toBe("203.0.113.5");
    expect(clientAddress(h("203.0.113.5, 10.1.2.3"))).toBe("203.0.113.5");
    expect(clientAddress(h("198.51.100.1, 203.0.113.5, 192.0.2.10, 10.1.2.3"))).toBe("203.0.113.5");
    expect(clientAddress(h("2001:db8::7, 2001:db8:1::1"))).toBeNull();
    expect(clientAddress(h("2001:db9::7, 2001:db8:1::1"))).toBe("2001:db9::7");
  });

  it("never believes what a client wrote to the left of the proxies' entries", () => {
    expect(clientAddress(h("127.0.0.1, 203.0.113.5, 10.0.0.1"))).toBe("203.0.113.5");
  });

  it("gives no address for garbage or a missing header", () => {
    expect(clientAddress(new Headers())).toBeNull();
    expect(clientAddress(h("not-an-address, 10.0.0.1"))).toBeNull();
    expect(clientAddress(h("::ffff:203.0.113.9, 10.0.0.1"))).toBe("203.0.113.9");
  });
});
