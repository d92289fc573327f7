// The durability-under-faults run (scripts/test-faults.ts) as part of npm test. It boots a stack of its own
// (PostgreSQL with fsync on, the stand-ins, its own app processes it kills and restarts) from this run's
// build, which it only reads: a Next build is not relocatable, and building again would double the time.
import { spawn } from "node:child_process";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

type Summary = {
  operations: number;
  acknowledged: number;
  retried: number;
  kills: number;
  appRestarts: number;
  pgRestarts: number;
  appCrashes: number;
  jobsChecked: number;
  eventsChecked: number;
  claimsChecked: number;
  messagesChecked: number;
  messagesRetried: number;
  messagesRecognisedAsRepeats: number;
  messageDuplicates: number;
  dualEvents: number;
  violations: number;
};

function runFaultScript(): Promise<{ code: number | null; output: string }> {
  const distDir = process.env.NEXT_DIST_DIR;
  if (!distDir) throw new Error("NEXT_DIST_DIR is not set: run the tests through npm test");
  return new Promise((resolve, reject) => {
    const child = spawn(join("node_modules", ".bin", "tsx"), ["--conditions=react-server", "scripts/test-faults.ts", "--skip-build"], {
      env: { ...process.env, BANDEDGE_TEST_DIST: distDir },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let output = "";
    child.stdout.on("data", (d: Buffer) => (output += d.toString()));
    child.stderr.on("data", (d: Buffer) => (output += d.toString()));
    child.on("error", reject);
    child.on("close", (code) => resolve({ code, output }));
  });
}

describe("durability under faults", () => {
  it("keeps every acknowledged write exactly once through two app kills and a PostgreSQL crash", async () => {
    const { code, output } = await runFaultScript();
    const line = output.split("\n").find((l) => l.startsWith("FAULT-TEST-SUMMARY "));
    expect(line, output.slice(-4000)).toBeDefined();
    const summary = JSON.parse(line!.slice("FAULT-TEST-SUMMARY ".length)) as Summary;
    expect(summary.violations, output.slice(-4000)).toBe(0);
    expect(code).toBe(0);
    expect(summary.operations).toBeGreaterThanOrEqual(2000);
    expect(summary.acknowledged).toBe(summary.operations);
    expect(summary.retried).toBeGreaterThan(0);
    expect({
      kills: summary.kills,
      appRestarts: summary.appRestarts,
      pgRestarts: summary.pgRestarts,
      appCrashes: summary.appCrashes,
    }).toEqual({
      kills: 2,
      appRestarts: 2,
      pgRestarts: 1,
      appCrashes: 0,
    });
    expect(summary.jobsChecked).toBeGreaterThan(0);
    expect(summary.eventsChecked).toBeGreaterThan(0);
    expect(summary.claimsChecked).toBeGreaterThan(0);
    // Messages carry an idempotency key like the other operations: each acknowledged one is stored once.
    expect(summary.messagesChecked).toBe(400);
    expect(summary.messageDuplicates).toBe(0);
    expect(summary.dualEvents).toBe(20);
  }, 480_000);
});
