import { testEnv } from "./env";
import { nextTestIp } from "./ip";

// A small HTTP client with a cookie jar, our Origin header and its own client address.
export class TestClient {
  readonly ip: string;
  /** Sent with every request (e.g. a spoofed internal header, to prove it changes nothing). */
  extraHeaders: Record<string, string> = {};
  private cookies = new Map<string, string>();

  constructor({ ip = nextTestIp() }: { ip?: string } = {}) {
    this.ip = ip;
  }

  cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  private remember(res: Response) {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(";");
      const idx = pair!.indexOf("=");
      const name = pair!.slice(0, idx).trim();
      const value = pair!.slice(idx + 1).trim();
      if (!value || /max-age=0/i.test(line)) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
  }

  async request(path: string, init: RequestInit & { json?: unknown } = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    for (const [k, v] of Object.entries(this.extraHeaders)) headers.set(k, v);
    headers.set("x-forwarded-for", this.ip);
    if (!headers.has("origin")) headers.set("origin", testEnv.appUrl);
    if (this.cookies.size) headers.set("cookie", this.cookieHeader());
    let body = init.body;
    if (init.json !== undefined) {
      headers.set("content-type", "application/json");
      body = JSON.stringify(init.json);
    }
    const res = await fetch(new URL(path, testEnv.appUrl), { ...init, headers, body, redirect: "manual" });
    this.remember(res);
    return res;
  }

  get(path: string, init: RequestInit = {}) {
    return this.request(path, { ...init, method: "GET" });
  }

  post(path: string, json?: unknown, init: RequestInit = {}) {
    return this.request(path, { ...init, method: "POST", json });
  }

  async signIn(email: string, password: string): Promise<Response> {
    const res = await this.post("/api/auth/sign-in/email", { email, password });
    if (!res.ok) throw new Error(`sign-in failed for ${email}: ${res.status} ${await res.text()}`);
    return res;
  }

  async signUp(name: string, email: string, password: string): Promise<Response> {
    return this.post("/api/auth/sign-up/email", { name, email, password, callbackURL: "/portal" });
  }

  /** Follows a link from an e-mail (verification, reset) with this client's cookies. */
  async follow(url: string): Promise<Response> {
    let res = await this.request(url.replace(/^https?:\/\/[^/]+/, ""), { method: "GET" });
    for (let i = 0; i < 5 && res.status >= 300 && res.status < 400; i++) {
      const loc = res.headers.get("location");
      if (!loc) break;
      res = await this.request(loc.replace(/^https?:\/\/[^/]+/, ""), { method: "GET" });
    }
    return res;
  }
}
