import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { TestClient } from "../support/http";
import { testEnv } from "../support/env";

// The mailbox page shows every message the mail stand-in received, password-reset links included, to
// anyone who opens it. It and the stand-ins exist only in the local-demo mode, which serves this machine
// only; a deployment that inherits a stand-in address refuses to start (common practice: fail closed on a
// dangerous configuration rather than serve with it).

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer();
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

const started: ChildProcess[] = [];
afterAll(() => {
  for (const c of started) if (c.exitCode === null) c.kill("SIGTERM");
});

const STAND_INS = ["RESEND_BASE_URL", "MAILBOX_URL", "STRIPE_API_BASE", "UPLOADTHING_API_URL", "UPLOADTHING_INGEST_URL"];

/** Starts one more instance of the test build; resolves when it answers or exits. */
async function startApp(env: Record<string, string | undefined>, hostname = "127.0.0.1") {
  const port = await freePort();
  const merged: NodeJS.ProcessEnv = { ...process.env, WORKER_ENABLED: "0", ...env };
  for (const [k, v] of Object.entries(env)) if (v === undefined) delete merged[k];
  const child = spawn(join(process.cwd(), "node_modules", ".bin", "next"), ["start", "--hostname", hostname, "--port", String(port)], {
    cwd: process.cwd(),
    env: merged,
    stdio: ["ignore", "pipe", "pipe"],
  });
  started.push(child);
  let output = "";
  child.stdout!.on("data", (d: Buffer) => (output += d.toString()));
  child.stderr!.on("data", (d: Buffer) => (output += d.toString()));
  const exited = new Promise<number>((resolve) => child.on("exit", (code) => resolve(code ?? -1)));
  const base = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  let exitCode: number | null = null;
  void exited.then((c) => (exitCode = c));
  while (Date.now() < deadline && exitCode === null) {
    try {
      const res = await fetch(`${base}/api/health`);
      if (res.status < 500) break;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return { child, base, exited, output: () => output, exitCode: () => exitCode };
}

describe("the local demo", () => {
  it("marks every page, signed in or not, as the local demo", async () => {
    const anonymous = new TestClient();
    for (const path of ["/", "/sign-in", "/verify", "/mailbox"]) {
      const html = await (await anonymous.get(path)).text();
      expect(html, path).toContain("data-local-demo");
      expect(html, path).toContain("Local demo");
    }
    const owner = new TestClient();
    await owner.signIn(DEMO.owner.email, DEMO.owner.password);
    expect(await (await owner.get("/office")).text()).toContain("data-local-demo");
  });

  it("refuses to start on an address other machines can reach", async () => {
    const app = await startApp({}, "0.0.0.0");
    const code = await Promise.race([app.exited, new Promise<number>((r) => setTimeout(() => r(-999), 30_000))]);
    expect(code, app.output()).not.toBe(-999);
    expect(code).not.toBe(0);
    expect(app.output()).toMatch(/local demo listens on loopback only/);
  });

  it("refuses a non-loopback site address", async () => {
    const app = await startApp({ APP_URL: "https://shop.kestrel-lane.example" });
    expect(await app.exited).not.toBe(0);
    expect(app.output()).toMatch(/APP_URL: the local demo serves only this machine/);
  });
});

describe("outside the local demo", () => {
  it("refuses to start when a stand-in address is set, naming it", async () => {
    const app = await startApp({ BANDEDGE_LOCAL_DEMO: "0" });
    expect(await app.exited).not.toBe(0);
    expect(app.output()).toMatch(/RESEND_BASE_URL: a stand-in address is allowed only in the local demo/);
    expect(app.output()).toMatch(/STRIPE_API_BASE/);
  });

  it("has no mailbox page and no local-demo mark, so a reset link cannot be read off the site", async () => {
    const off: Record<string, string | undefined> = { BANDEDGE_LOCAL_DEMO: "0" };
    for (const k of STAND_INS) off[k] = undefined;
    const app = await startApp(off);
    expect(app.exitCode(), app.output()).toBeNull();
    // Someone asks for a reset link for the shop owner, then looks for it on the site.
    await fetch(`${app.base}/api/auth/request-password-reset`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: testEnv.appUrl.replace(/:\d+$/, "") },
      body: JSON.stringify({ email: DEMO.owner.email, redirectTo: "/reset-password" }),
    });
    const mailbox = await fetch(`${app.base}/mailbox?to=${encodeURIComponent(DEMO.owner.email)}`);
    expect(mailbox.status).toBe(404);
    const html = await mailbox.text();
    expect(html).not.toContain("reset-password");
    expect(html).not.toContain("data-local-demo");
    expect(await (await fetch(`${app.base}/sign-in`)).text()).not.toContain("data-local-demo");
    app.child.kill("SIGTERM");
    await app.exited;
  });
});
