import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool } from "../support/db";
import { testEnv } from "../support/env";
import { createCertificate, stopQueue } from "./certificates-fixtures";

// Two app instances share one database, as behind a load balancer (common practice). Each keeps its own
// verification pages in memory; a revocation made through one must show on the other at its next view, not
// after some expiry, since a buyer deciding on a set reads that page.

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
afterAll(async () => {
  for (const c of started) if (c.exitCode === null) c.kill("SIGTERM");
  await stopQueue();
  await closeTestPool();
});

/** A second instance of the test build, rendering its kept pages through its own address. */
async function startSecondInstance(): Promise<string> {
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const child = spawn(join(process.cwd(), "node_modules", ".bin", "next"), ["start", "--hostname", "127.0.0.1", "--port", String(port)], {
    cwd: process.cwd(),
    env: { ...process.env, WORKER_ENABLED: "0", APP_INTERNAL_URL: base },
    stdio: "ignore",
  });
  started.push(child);
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline && child.exitCode === null) {
    try {
      if ((await fetch(`${base}/api/health`)).status < 500) return base;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`the second instance did not start (exit ${child.exitCode})`);
}

const view = async (base: string, code: string) =>
  (await fetch(`${base}/verify/${code}`, { headers: { "x-forwarded-for": "198.51.100.91" } })).text();

describe("the public verification page on two instances", () => {
  it("shows a revocation made through one instance at the other's very next view", async () => {
    const other = await startSecondInstance();
    const c = await createCertificate();
    for (const base of [testEnv.appUrl, other]) for (let i = 0; i < 2; i++) expect(await view(base, c.code)).toContain("Valid");

    const owner = await signedIn(DEMO.owner);
    expect((await owner.post(`/api/certificates/${c.certificateId}/revoke`, { reason: "Cabinet belongs to another set" })).status).toBe(
      200,
    );

    const after = await view(other, c.code);
    expect(after).toContain("Revoked on");
    expect(after).toContain("Cabinet belongs to another set");
    expect(await view(testEnv.appUrl, c.code)).toContain("Cabinet belongs to another set");
  }, 120_000);
});
