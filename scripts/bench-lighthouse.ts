// Lighthouse figures of QUALITY.md: performance and accessibility of the main pages, measured with the
// local chromium against a throwaway stack (loopback only, bounded in time). Lighthouse's default mobile
// config with simulated throttling. Prints a table; asserts nothing.
//
//   npx tsx scripts/bench-lighthouse.ts [--skip-build] [--runs=3] [--only=home,sign-in,verify,portal,job,bench,office]
//
// Each page is audited --runs times (default 3) and the run with the median performance score is shown, as
// Lighthouse's own guidance suggests: simulated throttling scales the CPU time it observes, so a busy machine
// lowers the figures. The median run's full report (JSON) goes to test-results/lighthouse/<page>.json.
import { spawn, type ChildProcess } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { createServer } from "node:net";
import { cpus, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import lighthouse, { type Flags, type Result } from "lighthouse";
import pg from "pg";
// @ts-expect-error plain ESM module without type declarations
import { bootScratchStack } from "./lib/scratch-stack.mjs";

type Stack = { env: Record<string, string>; appUrl: string; stop: () => void };
type Login = { email: string; password: string };
type Target = { key: string; label: string; path: string; login?: Login };
type Row = { label: string; perf: string; a11y: string; lcp: string; tbt: string; cls: string; runs: string; note: string };

const GOAL = { performance: 95, accessibility: 100 };
const PAGE_TIMEOUT_MS = 120_000; // one Lighthouse run
const MAX_RUNS = 9;
const CHROME_FLAGS = [
  "--headless=new",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-extensions",
  "--disable-default-apps",
  "--no-first-run",
  "--no-default-browser-check",
  "--mute-audio",
];

const OWNER: Login = { email: "mira.holloway@example.com", password: "demo-owner-2026" };
const TECH: Login = { email: "tomas@kestrel-lane.example", password: "bench-tech-2026" };
const SHOP: Login = { email: "odile@kestrel-lane.example", password: "bench-owner-2026" };

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const addr = srv.address();
      const port = typeof addr === "object" && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function withTimeout<T>(p: Promise<T>, ms: number, what: string): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const t = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`${what} took longer than ${ms / 1000} s`)), ms);
  });
  return Promise.race([p, t]).finally(() => clearTimeout(timer));
}

async function signIn(appUrl: string, { email, password }: Login): Promise<string> {
  const res = await fetch(`${appUrl}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: appUrl, "x-forwarded-for": `192.0.2.${Math.floor(Math.random() * 250)}` },
    body: JSON.stringify({ email, password }),
  });
  if (!res.ok) throw new Error(`sign-in as ${email} failed: ${res.status}`);
  const cookie = res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
  if (!cookie) throw new Error(`sign-in as ${email} set no cookie`);
  return cookie;
}

// The Debian chromium with a DevTools port on loopback, in its own process group so that stopping it ends
// the renderers too.
class Browser {
  private child?: ChildProcess;
  private profile?: string;
  port = 0;

  constructor(private readonly executable: string) {}

  async start(): Promise<void> {
    this.port = await freePort();
    this.profile = mkdtempSync(join(tmpdir(), "bandedge-lh-profile-"));
    const child = spawn(
      this.executable,
      [
        ...CHROME_FLAGS,
        `--remote-debugging-address=127.0.0.1`,
        `--remote-debugging-port=${this.port}`,
        `--user-data-dir=${this.profile}`,
        "about:blank",
      ],
      { detached: true, stdio: "ignore" },
    );
    this.child = child;
    const deadline = Date.now() + 30_000;
    while (Date.now() < deadline) {
      if (child.exitCode !== null) throw new Error(`chromium exited early (code ${child.exitCode})`);
      try {
        const res = await fetch(`http://127.0.0.1:${this.port}/json/version`);
        if (res.ok) return;
      } catch {
        // not listening yet
      }
      await sleep(200);
    }
    throw new Error("chromium did not open its DevTools port within 30 s");
  }

  async stop(): Promise<void> {
    const child = this.child;
    this.child = undefined;
    if (child?.pid && child.exitCode === null && child.signalCode === null) {
      const exited = new Promise<void>((r) => child.once("exit", () => r()));
      const signal = (s: NodeJS.Signals) => {
        try {
          process.kill(-child.pid!, s);
        } catch {
          // already gone
        }
      };
      signal("SIGTERM");
      await Promise.race([exited, sleep(5_000)]);
      if (child.exitCode === null && child.signalCode === null) {
        signal("SIGKILL");
        await Promise.race([exited, sleep(2_000)]);
      }
    }
    if (this.profile) rmSync(this.profile, { recursive: true, force: true });
    this.profile = undefined;
  }
}

function ms(v: number | undefined): string {
  if (v === undefined || Number.isNaN(v)) return "—";
  return v >= 1000 ? `${(v / 1000).toFixed(2)} s` : `${v.toFixed(0)} ms`;
}

function score(lhr: Result, id: "performance" | "accessibility"): number | null {
  const s = lhr.categories[id]?.score;
  return s === null || s === undefined ? null : Math.round(s * 100);
}

// The audits that cost points in a category. Accessibility: every weighted audit that failed. Performance:
// the weighted metrics below full marks, then the diagnostics that Lighthouse says would save time on a
// metric (the metricSavings it estimates), leaving out its hidden duplicates.
function failingAudits(lhr: Result, id: "performance" | "accessibility"): string[] {
  const cat = lhr.categories[id];
  if (!cat) return [];
  const lines: string[] = [];
  for (const ref of cat.auditRefs) {
    const a = lhr.audits[ref.id];
    if (!a || a.score === null || a.score >= (id === "performance" ? 0.9 : 1)) continue;
    if (a.scoreDisplayMode !== "binary" && a.scoreDisplayMode !== "numeric" && a.scoreDisplayMode !== "metricSavings") continue;
    let savings = "";
    if (id === "accessibility" && ref.weight === 0) continue;
    if (id === "performance" && ref.weight === 0) {
      if (ref.group === "hidden") continue;
      const saved = Object.entries(a.metricSavings ?? {}).filter(([, v]) => typeof v === "number" && v > 0);
      if (!saved.length) continue;
      savings = ` [saves ${saved.map(([k, v]) => `${k} ${k === "CLS" ? v!.toFixed(3) : ms(v)}`).join(", ")}]`;
    }
    let line = `  ${id === "performance" ? "perf" : "a11y"} ${a.id} (${Math.round(a.score * 100)}): ${a.title}${a.displayValue ? ` — ${a.displayValue}` : ""}${savings}`;
    const details = a.details as { type?: string; items?: { node?: { selector?: string; snippet?: string } }[] } | undefined;
    if (id === "accessibility" && details?.type === "table" && details.items?.length) {
      const nodes = details.items
        .slice(0, 4)
        .map((i) => i.node?.selector ?? i.node?.snippet)
        .filter(Boolean);
      if (nodes.length)
        line += `\n      at ${nodes.join("\n      at ")}${details.items.length > 4 ? `\n      … ${details.items.length - 4} more` : ""}`;
    }
    lines.push(line);
  }
  return lines;
}

async function targets(db: pg.Pool): Promise<Target[]> {
  const code = (
    await db.query<{ code: string }>(
      "select code from certificate where revoked_at is null and superseded_by_id is null order by issued_at limit 1",
    )
  ).rows[0]?.code;
  const jobId = (
    await db.query<{ id: string }>(
      `select j.id from job j join "user" u on u.id = j.customer_id where u.email = $1 order by j.created_at limit 1`,
      [OWNER.email],
    )
  ).rows[0]?.id;
  const list: Target[] = [
    { key: "home", label: "/", path: "/" },
    { key: "sign-in", label: "/sign-in", path: "/sign-in" },
  ];
  if (code) list.push({ key: "verify", label: "/verify/[code]", path: `/verify/${code}` });
  else console.warn("no live certificate in the seed: /verify/[code] left out");
  list.push({ key: "portal", label: "/portal (set owner)", path: "/portal", login: OWNER });
  if (jobId) list.push({ key: "job", label: "/portal/jobs/[id] (set owner)", path: `/portal/jobs/${jobId}`, login: OWNER });
  else console.warn("no job for the demo set owner: /portal/jobs/[id] left out");
  list.push({ key: "bench", label: "/bench (technician)", path: "/bench", login: TECH });
  list.push({ key: "office", label: "/office (shop owner)", path: "/office", login: SHOP });
  return list;
}

async function audit(browser: Browser, url: string, cookie: string | undefined): Promise<Result> {
  const flags: Flags = {
    port: browser.port,
    hostname: "127.0.0.1",
    output: "json",
    logLevel: "error",
    onlyCategories: ["performance", "accessibility"],
    maxWaitForLoad: 45_000,
    ...(cookie ? { extraHeaders: { Cookie: cookie } } : {}),
  };
  const result = await lighthouse(url, flags);
  if (!result) throw new Error("Lighthouse returned no result");
  return result.lhr;
}

async function main() {
  const only = process.argv
    .find((a) => a.startsWith("--only="))
    ?.slice("--only=".length)
    .split(",");
  const runsArg = process.argv.find((a) => a.startsWith("--runs="))?.slice("--runs=".length);
  const runs = runsArg === undefined ? 3 : Number(runsArg);
  if (!Number.isInteger(runs) || runs < 1 || runs > MAX_RUNS) throw new Error(`--runs must be a whole number from 1 to ${MAX_RUNS}`);
  const stack: Stack = await bootScratchStack({
    distDir: process.env.BANDEDGE_BENCH_DIST ?? ".next-test",
    build: !process.argv.includes("--skip-build"),
    chromium: true,
    extraEnv: { AUTH_RATE_LIMIT_MAX: "1000" },
  });
  const browser = new Browser(stack.env.CHROMIUM_PATH ?? "/usr/bin/chromium");
  const db = new pg.Pool({ connectionString: stack.env.DATABASE_URL, max: 1 });
  let stopping: Promise<void> | undefined;
  const stopAll = () =>
    (stopping ??= (async () => {
      await browser.stop().catch(() => undefined);
      await db.end().catch(() => undefined);
      stack.stop();
    })());
  const onSignal = (sig: NodeJS.Signals) => {
    console.error(`\n${sig}: stopping the browser and the stack…`);
    void stopAll().finally(() => process.exit(130));
  };
  process.once("SIGINT", onSignal);
  process.once("SIGTERM", onSignal);
  // Everything after the stack is up: a run takes about 20 s here, so 45 s a run on average is ample.
  const runTimeoutMs = 2 * 60_000 + 7 * runs * 45_000;
  const watchdog = setTimeout(() => {
    console.error(`\nThe Lighthouse runs took longer than ${Math.round(runTimeoutMs / 60_000)} min: stopping.`);
    void stopAll().finally(() => process.exit(1));
  }, runTimeoutMs);
  watchdog.unref();
  const loadBefore = loadavg()[0]!;

  const rows: Row[] = [];
  const findings: string[] = [];
  const reportDir = join(process.cwd(), "test-results", "lighthouse");
  mkdirSync(reportDir, { recursive: true });
  try {
    let list = await targets(db);
    if (only) list = list.filter((t) => only.includes(t.key));
    await browser.start();
    const cookies = new Map<Login, string>();
    for (const t of list) {
      let cookie: string | undefined;
      if (t.login) {
        cookie = cookies.get(t.login) ?? (await signIn(stack.appUrl, t.login));
        cookies.set(t.login, cookie);
      }
      const url = `${stack.appUrl}${t.path}`;
      const done: Result[] = [];
      let failure = "";
      for (let i = 0; i < runs; i++) {
        process.stderr.write(`lighthouse ${t.label} (run ${i + 1} of ${runs})…\n`);
        try {
          done.push(await withTimeout(audit(browser, url, cookie), PAGE_TIMEOUT_MS, `Lighthouse on ${t.label}`));
        } catch (e) {
          failure = (e as Error).message;
          // A run that hung may have left the browser in any state: start a fresh one.
          await browser.stop();
          await browser.start();
        }
      }
      if (!done.length) {
        rows.push({ label: t.label, perf: "—", a11y: "—", lcp: "—", tbt: "—", cls: "—", runs: "—", note: `failed: ${failure}` });
        continue;
      }
      const byPerf = [...done].sort((a, b) => (score(a, "performance") ?? -1) - (score(b, "performance") ?? -1));
      const lhr = byPerf[Math.floor((byPerf.length - 1) / 2)]!;
      writeFileSync(join(reportDir, `${t.key}.json`), JSON.stringify(lhr));
      const perf = score(lhr, "performance");
      const a11y = score(lhr, "accessibility");
      const notes: string[] = [];
      if (lhr.runtimeError) notes.push(`runtime error ${lhr.runtimeError.code}`);
      const landed = new URL(lhr.finalDisplayedUrl);
      if (landed.pathname !== t.path) notes.push(`landed on ${landed.pathname}`);
      if (failure) notes.push(`${runs - done.length} of ${runs} runs failed: ${failure}`);
      const under = (perf !== null && perf < GOAL.performance) || (a11y !== null && a11y < GOAL.accessibility);
      if (under) notes.push("under goal");
      rows.push({
        label: t.label,
        perf: perf === null ? "—" : String(perf),
        a11y: a11y === null ? "—" : String(a11y),
        lcp: ms(lhr.audits["largest-contentful-paint"]?.numericValue),
        tbt: ms(lhr.audits["total-blocking-time"]?.numericValue),
        cls: lhr.audits["cumulative-layout-shift"]?.numericValue?.toFixed(3) ?? "—",
        runs: byPerf.map((r) => score(r, "performance") ?? "—").join(" "),
        note: notes.join("; "),
      });
      if (under || notes.length) {
        const lines = [
          ...(perf !== null && perf < GOAL.performance ? failingAudits(lhr, "performance") : []),
          ...(a11y !== null && a11y < GOAL.accessibility ? failingAudits(lhr, "accessibility") : []),
        ];
        findings.push(
          `${t.label} (performance ${perf ?? "—"}, accessibility ${a11y ?? "—"}${notes.length ? `; ${notes.join("; ")}` : ""})`,
          ...lines,
        );
      }
    }
    if (rows.some((r) => r.note.includes("failed"))) process.exitCode = 1;
  } finally {
    clearTimeout(watchdog);
    await stopAll();
  }

  const version = (createRequire(import.meta.url)("lighthouse/package.json") as { version: string }).version;
  console.log(
    `\nBandedge Lighthouse ${version} — ${new Date().toISOString().slice(0, 10)}, ${cpus().length} cores (load average ${loadBefore.toFixed(1)} before, ${loadavg()[0]!.toFixed(1)} after), default mobile config, simulated throttling, median of ${runs} run${runs > 1 ? "s" : ""}\n`,
  );
  const goal = `performance ≥ ${GOAL.performance}, accessibility ≥ ${GOAL.accessibility}`;
  const head: Row = {
    label: "page",
    perf: "performance",
    a11y: "accessibility",
    lcp: "LCP",
    tbt: "TBT",
    cls: "CLS",
    runs: "performance of each run",
    note: "goal",
  };
  const cols: (keyof Row)[] = ["label", "perf", "a11y", "lcp", "tbt", "cls", "runs"];
  const width = Object.fromEntries(cols.map((c) => [c, Math.max(...[head, ...rows].map((r) => r[c].length))])) as Record<keyof Row, number>;
  const line = (r: Row, last: string) => `${cols.map((c) => r[c].padEnd(width[c])).join(" | ")} | ${last}`;
  console.log(line(head, "goal"));
  console.log(`${cols.map((c) => "-".repeat(width[c])).join("-|-")}-|-----`);
  for (const r of rows) console.log(line(r, `${goal}${r.note ? ` (${r.note})` : ""}`));
  if (findings.length) {
    console.log("\nWhat costs points on the pages under goal:");
    for (const f of findings) console.log(f);
  }
  console.log(`\nFull reports: ${reportDir}`);
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
