// HTTP figures of QUALITY.md, measured side by side in one run on a throwaway stack (loopback only,
// bounded in count and time). Prints a table; asserts nothing.
import { randomUUID } from "node:crypto";
import { cpus, totalmem } from "node:os";
import autocannon from "autocannon";
import pg from "pg";
import sharp from "sharp";
import Stripe from "stripe";
// @ts-expect-error plain ESM module without type declarations
import { bootScratchStack } from "./lib/scratch-stack.mjs";

type Stack = { env: Record<string, string>; appUrl: string; stop: () => void };
type Row = { metric: string; figure: string; goal: string };
const rows: Row[] = [];

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i]!;
}

async function cannon(opts: autocannon.Options): Promise<autocannon.Result> {
  return new Promise((resolve, reject) => {
    autocannon({ duration: 8, ...opts }, (err, result) => (err ? reject(err) : resolve(result)));
  });
}

async function signIn(appUrl: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${appUrl}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: appUrl, "x-forwarded-for": `192.0.2.${Math.floor(Math.random() * 250)}` },
    body: JSON.stringify({ email, password }),
  });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
}

function errorsOf(r: autocannon.Result): number {
  return r.errors + r.timeouts + r.non2xx;
}

async function listVsBare(stack: Stack, cookie: string, connections: number) {
  const bareUrl = `${stack.appUrl}/api/health`;
  const listUrl = `${stack.appUrl}/api/bench/queue?page=1&pageSize=25`;
  // A short warm-up of both (discarded): the first seconds after a start measure the compiler, not the route.
  await cannon({ url: bareUrl, connections, duration: 3 });
  await cannon({ url: listUrl, connections, headers: { cookie }, duration: 3 });
  // Alternating rounds, so a machine whose load drifts during the run weighs on both figures alike.
  const rounds = 3;
  const bare: autocannon.Result[] = [];
  const list: autocannon.Result[] = [];
  for (let i = 0; i < rounds; i++) {
    bare.push(await cannon({ url: bareUrl, connections, duration: 5 }));
    list.push(await cannon({ url: listUrl, connections, headers: { cookie }, duration: 5 }));
  }
  const rate = (rs: autocannon.Result[]) => rs.reduce((a, r) => a + r.requests.total, 0) / rs.reduce((a, r) => a + r.duration, 0);
  const worstP97 = (rs: autocannon.Result[]) => Math.max(...rs.map((r) => r.latency.p97_5));
  const errors = (rs: autocannon.Result[]) => rs.reduce((a, r) => a + errorsOf(r), 0);
  rows.push({
    metric: `bare static JSON, ${connections} conns (${rounds} × 5 s)`,
    figure: `${rate(bare).toFixed(0)} req/s, p97.5 ≤ ${worstP97(bare)} ms, errors ${errors(bare)}`,
    goal: "baseline",
  });
  rows.push({
    metric: `authenticated JSON list, ${connections} conns (${rounds} × 5 s, between)`,
    figure: `${rate(list).toFixed(0)} req/s (${(rate(list) / rate(bare)).toFixed(2)}× bare), p97.5 ≤ ${worstP97(list)} ms, errors ${errors(list)}`,
    goal: connections === 10 ? "≥ 0.35× bare, p97.5 ≤ 60 ms, 0 errors" : "≥ 0.5× bare, p97.5 ≤ 300 ms, 0 errors",
  });
}

async function webhookBurst(stack: Stack, db: pg.Pool) {
  const stripe = new Stripe("sk_test_bench");
  const secret = stack.env.STRIPE_WEBHOOK_SECRET!;
  const unique = 400;
  const events = Array.from({ length: unique }, () => ({
    id: `evt_bench_${randomUUID().replace(/-/g, "")}`,
    object: "event",
    type: "checkout.session.completed",
    created: Math.floor(Date.now() / 1000),
    data: {
      object: {
        id: `cs_bench_${randomUUID().replace(/-/g, "")}`,
        object: "checkout.session",
        payment_status: "paid",
        amount_total: 1000,
        currency: "usd",
        metadata: {},
      },
    },
  }));
  // Warm the route first at the same concurrency (module load, JIT, the database pool's connections), as the
  // PDF figure does; these events are not counted.
  await Promise.all(
    Array.from({ length: 10 }, async () => {
      for (let i = 0; i < 5; i++) {
        const payload = JSON.stringify({ ...events[0]!, id: `evt_warm_${randomUUID().replace(/-/g, "")}` });
        const headers = {
          "stripe-signature": stripe.webhooks.generateTestHeaderString({ payload, secret }),
          "content-type": "application/json",
        };
        await (await fetch(`${stack.appUrl}/api/webhooks/stripe`, { method: "POST", headers, body: payload })).arrayBuffer();
      }
    }),
  );
  const sends = [...events, ...events.slice(0, 100)].sort(() => Math.random() - 0.5);
  const latencies: number[] = [];
  let errors = 0;
  const queue = [...sends];
  await Promise.all(
    Array.from({ length: 10 }, async () => {
      for (let e = queue.pop(); e; e = queue.pop()) {
        const payload = JSON.stringify(e);
        const header = stripe.webhooks.generateTestHeaderString({ payload, secret });
        const t0 = performance.now();
        const res = await fetch(`${stack.appUrl}/api/webhooks/stripe`, {
          method: "POST",
          headers: { "stripe-signature": header, "content-type": "application/json" },
          body: payload,
        });
        await res.arrayBuffer();
        latencies.push(performance.now() - t0);
        if (res.status >= 300) errors++;
      }
    }),
  );
  latencies.sort((a, b) => a - b);
  const stored = await db.query<{ n: number }>("select count(*)::int as n from payment_event where id like 'evt_bench_%'");
  rows.push({
    metric: "webhook burst, 500 signed events (20 % duplicates)",
    figure: `p97.5 ${percentile(latencies, 97.5).toFixed(1)} ms, errors ${errors}, events stored ${stored.rows[0]!.n} of ${unique} unique`,
    goal: "p97.5 ≤ 100 ms, final state exact",
  });
}

async function certificatePdf(stack: Stack, db: pg.Pool, ownerCookie: string) {
  const cert = await db.query<{ id: string }>(
    "select id from certificate where revoked_at is null and superseded_by_id is null order by issued_at limit 1",
  );
  if (!cert.rows.length) {
    rows.push({ metric: "certificate PDF", figure: "no certificate in the seed", goal: "—" });
    return;
  }
  const { id } = cert.rows[0]!;
  const pdfUrl = `${stack.appUrl}/api/certificates/${id}/pdf`;
  // A figure for an error page would be meaningless: every answer must be a PDF.
  const fetchPdf = async (): Promise<boolean> => {
    const r = await fetch(pdfUrl, { headers: { cookie: ownerCookie } });
    const body = Buffer.from(await r.arrayBuffer());
    return r.status === 200 && body.subarray(0, 5).toString("latin1") === "%PDF-";
  };
  for (let i = 0; i < 3; i++) if (!(await fetchPdf())) throw new Error("the certificate PDF did not answer with a PDF while warming up");
  const times: number[] = [];
  for (let i = 0; i < 30; i++) {
    const t0 = performance.now();
    if (!(await fetchPdf())) throw new Error("the certificate PDF did not answer with a PDF");
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  rows.push({
    metric: "certificate PDF, warm",
    figure: `p50 ${percentile(times, 50).toFixed(0)} ms, p95 ${percentile(times, 95).toFixed(0)} ms`,
    goal: "p95 ≤ 300 ms",
  });

  const idle = await cannon({ url: `${stack.appUrl}/api/health`, connections: 2, duration: 4 });
  let rendering = true;
  let rendered = 0;
  let failed = 0;
  const renderers = Array.from({ length: 4 }, async () => {
    while (rendering) {
      if (await fetchPdf()) rendered++;
      else failed++;
    }
  });
  const busy = await cannon({ url: `${stack.appUrl}/api/health`, connections: 2, duration: 4 });
  rendering = false;
  await Promise.all(renderers);
  rows.push({
    metric: "JSON latency while 4 PDFs render",
    figure: `mean ${busy.latency.average.toFixed(1)} ms vs idle ${idle.latency.average.toFixed(1)} ms (${(busy.latency.average / Math.max(idle.latency.average, 0.01)).toFixed(1)}×); ${rendered} PDFs, ${failed} not PDFs`,
    goal: "≤ 2× idle",
  });
}

async function verifyPage(stack: Stack, db: pg.Pool) {
  const cert = await db.query<{ code: string }>(
    "select code from certificate where revoked_at is null and superseded_by_id is null order by issued_at limit 1",
  );
  const code = cert.rows[0]?.code;
  if (!code) {
    rows.push({ metric: "public verification page", figure: "no certificate in the seed", goal: "—" });
    return;
  }
  // One client address throughout, as a buyer (or a benchmark) behind one connection would be: views of a real
  // certificate are never limited, so the figure is the page itself. The bare route is measured just before,
  // at the same concurrency, so both figures see the same machine.
  const headers = { "x-forwarded-for": "198.51.100.77" };
  const url = `${stack.appUrl}/verify/${code}`;
  const first = await fetch(url, { headers });
  const firstHtml = await first.text();
  if (first.status !== 200 || !firstHtml.includes(code))
    throw new Error(`the verification page did not show the certificate (status ${first.status})`);
  // Alternating short rounds, so a machine whose load drifts during the run weighs on both figures alike.
  const rounds = 3;
  const bare: autocannon.Result[] = [];
  const verify: autocannon.Result[] = [];
  for (let i = 0; i < rounds; i++) {
    bare.push(await cannon({ url: `${stack.appUrl}/api/health`, connections: 20, headers, duration: 4 }));
    verify.push(await cannon({ url, connections: 20, headers, duration: 4 }));
  }
  const rate = (rs: autocannon.Result[]) => rs.reduce((a, r) => a + r.requests.total, 0) / rs.reduce((a, r) => a + r.duration, 0);
  const worstP97 = (rs: autocannon.Result[]) => Math.max(...rs.map((r) => r.latency.p97_5));
  const errors = (rs: autocannon.Result[]) => rs.reduce((a, r) => a + errorsOf(r), 0);
  rows.push({
    metric: `bare static JSON, 20 conns, one address (${rounds} × 4 s)`,
    figure: `${rate(bare).toFixed(0)} req/s, p97.5 ≤ ${worstP97(bare)} ms, errors ${errors(bare)}`,
    goal: "baseline",
  });
  rows.push({
    metric: `public verification page, 20 conns, one address (${rounds} × 4 s, between)`,
    figure: `${rate(verify).toFixed(0)} req/s (${(rate(verify) / rate(bare)).toFixed(2)}× bare), p97.5 ≤ ${worstP97(verify)} ms, errors ${errors(verify)}`,
    goal: "≥ 0.5× bare, p97.5 ≤ 80 ms, 0 errors",
  });
  // Guessing: unknown codes from one address meet the limit (429 with Retry-After); counted, not timed.
  let limited = 0;
  let retryAfter = "";
  for (let i = 0; i < 80; i++) {
    const guess = `${String(i).padStart(4, "0")}-0000-0000-0000-0000-0000-0000`;
    const r = await fetch(`${stack.appUrl}/verify/${guess}`, { headers: { "x-forwarded-for": "198.51.100.78" } });
    await r.arrayBuffer();
    if (r.status === 429) {
      limited++;
      retryAfter ||= r.headers.get("retry-after") ?? "none";
    }
  }
  rows.push({
    metric: "guessing: 80 unknown codes from one address",
    figure: `${limited} answered 429 (first Retry-After ${retryAfter || "—"} s)`,
    goal: "limited after 60 a minute",
  });
}

async function photoReencode() {
  const { processPhoto } = await import("@/lib/server/uploads/photos");
  const width = 4000;
  const height = 3000;
  const noise = Buffer.alloc(width * height * 3);
  for (let i = 0; i < noise.length; i++) noise[i] = (i * 2654435761) >>> 24;
  const jpeg = await sharp(noise, { raw: { width, height, channels: 3 } })
    .jpeg({ quality: 90 })
    .toBuffer();
  const rssBefore = process.memoryUsage().rss;
  const times: number[] = [];
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    await processPhoto(jpeg);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const rssGrowth = (process.memoryUsage().rss - rssBefore) / 1024 / 1024;
  rows.push({
    metric: "photo re-encode, 12 MP JPEG",
    figure: `median ${times[1]!.toFixed(0)} ms, RSS growth ${rssGrowth.toFixed(0)} MiB`,
    goal: "≤ 1.2 s, memory bounded",
  });
}

// JavaScript a first visit needs: the scripts the page's own HTML loads (framework, page and its client
// components), sized as the browser received them (Resource Timing, cold cache). Chunks the router fetches
// afterwards to prefetch linked pages are not part of the page's own cost and are left out.
async function firstLoadJs(stack: Stack, db: pg.Pool) {
  const { chromium } = await import("playwright-core");
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--no-first-run",
    ],
  });
  const code = (await db.query<{ code: string }>("select code from certificate order by issued_at limit 1")).rows[0]?.code;
  const plan: { who: string; login?: [string, string]; paths: string[] }[] = [
    { who: "anonymous", paths: ["/", "/sign-in", "/sign-up", ...(code ? [`/verify/${code}`] : [])] },
    { who: "set owner", login: ["mira.holloway@example.com", "demo-owner-2026"], paths: ["/portal", "/portal/request"] },
    { who: "technician", login: ["tomas@kestrel-lane.example", "bench-tech-2026"], paths: ["/bench", "/bench/calculator"] },
    { who: "shop owner", login: ["odile@kestrel-lane.example", "bench-owner-2026"], paths: ["/office", "/office/reports"] },
  ];
  const measured: { path: string; decoded: number; encoded: number }[] = [];
  try {
    for (const p of plan) {
      const cookie = p.login ? await signIn(stack.appUrl, p.login[0], p.login[1]) : "";
      for (const path of p.paths) {
        const ctx = await browser.newContext();
        if (cookie) {
          await ctx.addCookies(
            cookie.split("; ").map((c) => ({ name: c.slice(0, c.indexOf("=")), value: c.slice(c.indexOf("=") + 1), url: stack.appUrl })),
          );
        }
        const page = await ctx.newPage();
        const url = `${stack.appUrl}${path}`;
        const response = await page.goto(url, { waitUntil: "load" });
        if (!response || response.status() !== 200 || new URL(page.url()).pathname !== new URL(url).pathname) {
          throw new Error(`${path} did not answer with its own page (status ${response?.status()}, now at ${page.url()})`);
        }
        const html = await response.text();
        const own = new Set([...html.matchAll(/<script[^>]*\ssrc="([^"]+)"/g)].map((m) => new URL(m[1]!.replace(/&amp;/g, "&"), url).href));
        await page.waitForLoadState("networkidle");
        const entries = await page.evaluate(() =>
          (performance.getEntriesByType("resource") as PerformanceResourceTiming[]).map((e) => ({
            name: e.name,
            decoded: e.decodedBodySize,
            encoded: e.encodedBodySize,
          })),
        );
        const mine = entries.filter((e) => own.has(e.name));
        measured.push({
          path: path.startsWith("/verify/") ? "/verify/[code]" : path,
          decoded: mine.reduce((a, e) => a + e.decoded, 0),
          encoded: mine.reduce((a, e) => a + e.encoded, 0),
        });
        await ctx.close();
      }
    }
  } finally {
    await browser.close();
  }
  const kib = (n: number) => (n / 1024).toFixed(0);
  const lightest = [...measured]
    .sort((a, b) => a.decoded - b.decoded)
    .slice(0, 4)
    .map((m) => m.path);
  rows.push({
    metric: "JavaScript on first load (decoded / compressed KiB)",
    figure: `${measured.map((m) => `${m.path} ${kib(m.decoded)}/${kib(m.encoded)}`).join(", ")}; lightest first: ${lightest.join(" ≤ ")}`,
    goal: "verification and sign-in the lightest",
  });
}

// `--only=list,webhook,pdf,verify,js,photo` runs a subset (the default is every part).
const PARTS = ["list", "webhook", "pdf", "verify", "js", "photo"] as const;
const onlyArg = process.argv.find((a) => a.startsWith("--only="));
const selected = new Set(onlyArg ? onlyArg.slice("--only=".length).split(",") : PARTS);
for (const s of selected) if (!(PARTS as readonly string[]).includes(s)) throw new Error(`unknown part "${s}"; parts: ${PARTS.join(", ")}`);

async function main() {
  const stack: Stack = await bootScratchStack({
    distDir: process.env.BANDEDGE_BENCH_DIST ?? ".next-test",
    build: !process.argv.includes("--skip-build"),
    extraEnv: { AUTH_RATE_LIMIT_MAX: "1000" },
  });
  const db = new pg.Pool({ connectionString: stack.env.DATABASE_URL, max: 2 });
  try {
    const techCookie = await signIn(stack.appUrl, "tomas@kestrel-lane.example", "bench-tech-2026");
    const ownerCookie = await signIn(stack.appUrl, "odile@kestrel-lane.example", "bench-owner-2026");
    // A part that fails is shown as such in the table; the other parts' figures are still printed.
    const part = async (name: (typeof PARTS)[number], run: () => Promise<void>) => {
      if (!selected.has(name)) return;
      try {
        await run();
      } catch (e) {
        process.exitCode = 1;
        rows.push({ metric: `${name} (failed)`, figure: e instanceof Error ? e.message.split("\n")[0]! : String(e), goal: "—" });
      }
    };
    await part("list", async () => {
      await listVsBare(stack, techCookie, 10);
      await listVsBare(stack, techCookie, 50);
    });
    await part("webhook", () => webhookBurst(stack, db));
    await part("pdf", () => certificatePdf(stack, db, ownerCookie));
    await part("verify", () => verifyPage(stack, db));
    await part("js", () => firstLoadJs(stack, db));
    Object.assign(process.env, stack.env);
    await part("photo", () => photoReencode());
  } finally {
    await db.end();
    stack.stop();
  }
  console.log(
    `\nBandedge HTTP benchmarks — ${new Date().toISOString().slice(0, 10)}, ${cpus().length} cores, ${(totalmem() / 2 ** 30).toFixed(0)} GiB\n`,
  );
  const w = Math.max(...rows.map((r) => r.metric.length));
  const f = Math.max(...rows.map((r) => r.figure.length));
  console.log(`${"metric".padEnd(w)} | ${"figure".padEnd(f)} | goal`);
  console.log(`${"-".repeat(w)}-|-${"-".repeat(f)}-|-----`);
  for (const r of rows) console.log(`${r.metric.padEnd(w)} | ${r.figure.padEnd(f)} | ${r.goal}`);
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
