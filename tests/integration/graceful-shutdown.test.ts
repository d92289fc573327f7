// SIGTERM under load, on a stack of its own (PostgreSQL, stand-ins and one app instance from this run's
// build). What "graceful" means is the common practice of process managers (systemd, Kubernetes): after
// SIGTERM the server stops taking connections, answers the requests it holds, finishes or hands back its
// background work, and exits on its own within a grace period, before anyone resorts to SIGKILL. Exit code
// 143 is the shell convention for a process ended by SIGTERM (128 + 15).
import { once } from "node:events";
import http from "node:http";
import type { ChildProcess } from "node:child_process";
import { join } from "node:path";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
// @ts-expect-error plain ESM module without type declarations
import { bootScratchStack } from "../../scripts/lib/scratch-stack.mjs";
// @ts-expect-error plain ESM module without type declarations
import { freePort } from "../../scripts/lib/stack.mjs";
import { DEMO } from "../support/accounts";

type Stack = { env: Record<string, string>; appUrl: string; scratch: string; app: ChildProcess; stop(): void };
type Outcome = { status?: number; body?: string; error?: string };

const GRACE_MS = 15_000;
const MAIL_DELAY_MS = 1_000;
let stack: Stack;
let mail: http.Server;
const mailReceived: string[] = [];
let db: pg.Pool;

// A mail provider that takes a second per message, so the queue worker is caught mid-delivery.
async function startSlowMail(): Promise<string> {
  const port = (await freePort()) as number;
  mail = http.createServer((req, res) => {
    const key = String(req.headers["idempotency-key"] ?? "");
    req.resume();
    req.on("end", () => {
      if (req.url?.startsWith("/emails")) mailReceived.push(key);
      setTimeout(() => {
        res.writeHead(200, { "content-type": "application/json" });
        res.end(JSON.stringify({ id: `slow-${mailReceived.length}` }));
      }, MAIL_DELAY_MS);
    });
  });
  mail.listen(port, "127.0.0.1");
  await once(mail, "listening");
  return `http://127.0.0.1:${port}`;
}

beforeAll(async () => {
  const distDir = process.env.NEXT_DIST_DIR;
  if (!distDir) throw new Error("NEXT_DIST_DIR is not set: run the tests through npm test");
  const mailUrl = await startSlowMail();
  stack = await bootScratchStack({
    distDir,
    build: false,
    extraEnv: { RESEND_BASE_URL: mailUrl, SHUTDOWN_GRACE_MS: String(GRACE_MS) },
    appLog: join(process.env.TEST_SCRATCH ?? "/tmp", "graceful-shutdown-app.log"),
  });
  db = new pg.Pool({ connectionString: stack.env.DATABASE_URL, max: 2 });
}, 240_000);

afterAll(async () => {
  await db?.end();
  stack?.stop();
  mail?.close();
});

let ipSeq = 0;
function post(path: string, body: unknown): Promise<Response> {
  return fetch(new URL(path, stack.appUrl), {
    method: "POST",
    headers: { "content-type": "application/json", origin: stack.appUrl, "x-forwarded-for": `10.201.0.${++ipSeq}` },
    body: JSON.stringify(body),
  });
}

/**
 * A sign-in whose body arrives in two parts: the connection is open and the request under way before
 * SIGTERM; the rest of the body (and so every database query of the sign-in) comes after it.
 */
function splitSignIn(
  who: { email: string; password: string },
  release: Promise<void>,
): { connected: Promise<void>; done: Promise<Outcome> } {
  const body = JSON.stringify(who);
  let connected!: () => void;
  const connectedP = new Promise<void>((r) => (connected = r));
  const done = new Promise<Outcome>((resolve) => {
    const req = http.request(new URL("/api/auth/sign-in/email", stack.appUrl), {
      method: "POST",
      agent: false,
      headers: {
        "content-type": "application/json",
        "content-length": Buffer.byteLength(body),
        origin: stack.appUrl,
        "x-forwarded-for": `10.202.0.${++ipSeq}`,
        connection: "close",
      },
    });
    req.on("socket", (s) => s.on("connect", connected));
    req.on("response", (res) => {
      let data = "";
      res.on("data", (d: Buffer) => (data += d.toString()));
      res.on("end", () => resolve({ status: res.statusCode, body: data }));
      res.on("error", (e: NodeJS.ErrnoException) => resolve({ error: e.code ?? e.message }));
    });
    req.on("error", (e: NodeJS.ErrnoException) => resolve({ error: e.code ?? e.message }));
    req.write(body.slice(0, 12));
    void release.then(() => req.end(body.slice(12)));
  });
  return { connected: connectedP, done };
}

describe("SIGTERM under load", () => {
  it("answers every request in flight, lets the queue worker finish its deliveries, and exits in time", async () => {
    // Mail for the worker: a reset request for each of five accounts.
    for (const who of [DEMO.owner, DEMO.tech, DEMO.tech2, DEMO.customer, DEMO.customer2]) {
      const res = await post("/api/auth/request-password-reset", { email: who.email, redirectTo: "/reset-password" });
      expect(res.status).toBe(200);
    }
    await expect
      .poll(async () => (await db.query("select count(*)::int as n from pgboss.job where name = 'email' and state = 'active'")).rows[0].n, {
        timeout: 30_000,
      })
      .toBeGreaterThan(0);

    let release!: () => void;
    const released = new Promise<void>((r) => (release = r));
    const who = [DEMO.customer, DEMO.customer2, DEMO.tech, DEMO.tech2, DEMO.owner, DEMO.customer];
    const inFlight = who.map((w) => splitSignIn(w, released));
    await Promise.all(inFlight.map((r) => r.connected));
    await new Promise((r) => setTimeout(r, 300));

    const t0 = Date.now();
    const exited = once(stack.app, "exit") as Promise<[number | null, NodeJS.Signals | null]>;
    stack.app.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 300));
    release();

    const outcomes = await Promise.all(inFlight.map((r) => r.done));
    for (const o of outcomes) {
      expect(o.error, JSON.stringify(o)).toBeUndefined();
      expect(o.status, o.body).toBe(200);
      expect(JSON.parse(o.body!)).toHaveProperty("user");
    }

    const [code, signal] = await exited;
    const took = Date.now() - t0;
    expect(signal, "ended by a signal rather than by itself").toBeNull();
    expect(code, "exited by the grace-period guard").not.toBe(1);
    expect(code).toBe(143);
    expect(took).toBeLessThan(GRACE_MS + 3_000);

    // Nothing was left half done by the worker: no job still marked as being worked, and every message the
    // provider received is recorded as sent.
    const active = await db.query("select id from pgboss.job where name = 'email' and state = 'active'");
    expect(active.rows).toEqual([]);
    const ids = mailReceived.map((k) => k.replace(/^outbox-/, "")).filter(Boolean);
    expect(ids.length).toBeGreaterThan(0);
    const rows = await db.query<{ id: string; status: string }>("select id, status from email_outbox where id = any($1::uuid[])", [ids]);
    expect(rows.rows.filter((r) => r.status !== "sent")).toEqual([]);
    expect(rows.rows.length).toBe(new Set(ids).size);
  }, 120_000);
});
