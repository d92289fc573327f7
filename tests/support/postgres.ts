// Stopping, starting and freezing the test stack's PostgreSQL cluster (the fault tests). A stop is pg_ctl's
// fast shutdown; a freeze is SIGSTOP on the postmaster and every process it forked (backends included), so
// connections stay open and nothing answers, as with a hung host; SIGCONT thaws it.
import { spawnSync } from "node:child_process";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";

const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

function need(name: string): string {
  const v = process.env[name];
  if (!v) throw new Error(`${name} is not set: run the tests through npm test`);
  return v;
}

const dataDir = () => join(need("TEST_SCRATCH"), "pgdata");

function pgCtl(args: string[]): void {
  const cmd = join(need("PG_BIN"), "pg_ctl");
  const r = isRoot
    ? spawnSync("runuser", ["-u", "postgres", "--", cmd, ...args], { encoding: "utf8" })
    : spawnSync(cmd, args, { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`pg_ctl ${args.join(" ")} failed: ${r.stderr || r.stdout}`);
}

// The options the cluster was started with, as PostgreSQL itself recorded them (postmaster.opts).
let startOptions: string | undefined;

export function stopPostgres(): void {
  const recorded = readFileSync(join(dataDir(), "postmaster.opts"), "utf8").trim();
  startOptions = recorded.replace(/^\S+\s+/, "").replace(/"-D"\s+"[^"]*"\s*/, "");
  pgCtl(["-D", dataDir(), "-m", "fast", "-w", "stop"]);
}

export function startPostgres(): void {
  if (startOptions === undefined) throw new Error("startPostgres() without stopPostgres()");
  pgCtl(["-D", dataDir(), "-l", join(need("TEST_SCRATCH"), "postgres.log"), "-o", startOptions, "-w", "-t", "60", "start"]);
}

function postgresProcesses(): number[] {
  const postmaster = Number(readFileSync(join(dataDir(), "postmaster.pid"), "utf8").split("\n")[0]);
  const children: number[] = [];
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      if (ppid === postmaster) children.push(Number(entry));
    } catch {
      // the process ended while we looked
    }
  }
  return [postmaster, ...children];
}

let frozen: number[] = [];

export function freezePostgres(): void {
  frozen = postgresProcesses();
  for (const pid of frozen) process.kill(pid, "SIGSTOP");
}

export function thawPostgres(): void {
  for (const pid of frozen) {
    try {
      process.kill(pid, "SIGCONT");
    } catch {
      // gone
    }
  }
  frozen = [];
}
