// Durability under faults (npm run test:faults). On a throwaway stack with PostgreSQL's fsync on, a client
// issues a bounded number of operations (photo uploads, quote requests, checkouts, signed webhooks, warranty
// claims, messages), each with its own idempotency key, through several concurrent workers, and keeps a
// ledger of what was acknowledged. Meanwhile the app is killed with SIGKILL and restarted twice and
// PostgreSQL is stopped in immediate mode and started again once; unacknowledged operations are retried
// with the same key (bounded, with back-off). Afterwards every acknowledged write must be present exactly
// once and the invariants must hold. Then two app instances receive the same webhooks at the same moment.
// Loopback only; prints the counts; exits non-zero on any violation.
//   --skip-build  reuse the last build in the dist dir (BANDEDGE_TEST_DIST, default .next-faults)
import type { ChildProcess } from "node:child_process";
import { randomUUID } from "node:crypto";
import { existsSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import pg from "pg";
import sharp from "sharp";
import Stripe from "stripe";
import type { JobState } from "@/db/schema/enums";
import { TRANSITIONS } from "@/lib/engine/jobs/states";
// @ts-expect-error plain ESM module without type declarations
import { bootScratchStack } from "./lib/scratch-stack.mjs";
// @ts-expect-error plain ESM module without type declarations
import { freePort, waitForHttp } from "./lib/stack.mjs";

// ---- bounds ----
const WORKERS = 8;
const CUSTOMERS = 8;
const QUOTES = 400; // each is an upload, then the quote request with its ticket
const PAYMENTS = 250; // each is a checkout, the payment at the stand-in, the webhook and one redelivery
const CLAIMS = 150;
const MESSAGES = 400;
const DUAL_EVENTS = 20;
const DUAL_DELIVERIES_PER_INSTANCE = 3;
const MAX_ATTEMPTS = 20;
const REQUEST_TIMEOUT_MS = 15_000;
const RUN_DEADLINE_MS = 8 * 60_000;
const FAULTS: { at: number; kind: "app" | "pg" }[] = [
  { at: 0.2, kind: "app" },
  { at: 0.45, kind: "pg" },
  { at: 0.7, kind: "app" },
];

type Cluster = { stop(mode?: string): void; start(): void; setting(name: string): string };
type Stack = {
  env: Record<string, string>;
  appUrl: string;
  scratch: string;
  stop(): void;
  app: ChildProcess;
  startApp(port?: number, opts?: { name?: string }): ChildProcess;
  cluster: Cluster;
};

type Kind = "upload" | "quote" | "checkout" | "webhook" | "claim" | "message";
type OpRecord = { kind: Kind; key: string; attempts: number; outcome: "acked" | "refused" | "gave-up"; detail: string };
type Attempt<T> = { ack: true; value: T } | { ack: false; retry: boolean; detail: string };

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const violations: string[] = [];
const ops: OpRecord[] = [];
const counts = { kills: 0, appRestarts: 0, pgRestarts: 0, appCrashes: 0 };
const startedAt = Date.now();

function violation(message: string) {
  violations.push(message);
  if (violations.length <= 40) process.stderr.write(`  ✕ ${message}\n`);
}

// ---- HTTP client: one cookie jar per person, our Origin, its own client address ----

let ipCounter = 0;
class Client {
  private cookies = new Map<string, string>();
  readonly ip = `10.77.${(++ipCounter >> 8) & 255}.${ipCounter & 255}`;
  constructor(
    readonly appUrl: string,
    readonly label: string,
    public userId = "",
  ) {}

  async request(path: string, init: RequestInit & { json?: unknown } = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    headers.set("x-forwarded-for", this.ip);
    headers.set("origin", this.appUrl);
    if (this.cookies.size) headers.set("cookie", [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; "));
    let body = init.body;
    if (init.json !== undefined) {
      headers.set("content-type", "application/json");
      body = JSON.stringify(init.json);
    }
    const res = await fetch(new URL(path, this.appUrl), { ...init, headers, body, redirect: "manual" });
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(";");
      const i = pair!.indexOf("=");
      const name = pair!.slice(0, i).trim();
      const value = pair!.slice(i + 1).trim();
      if (!value || /max-age=0/i.test(line)) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    return res;
  }
}

// ---- one operation: bounded retries with the same key, back-off, a timeout per attempt ----

function retryable(status: number): boolean {
  return status >= 500 || status === 408 || status === 429;
}

async function perform<T>(kind: Kind, key: string, attempt: (signal: AbortSignal) => Promise<Attempt<T>>): Promise<T | null> {
  const rec: OpRecord = { kind, key, attempts: 0, outcome: "gave-up", detail: "" };
  ops.push(rec);
  for (let n = 1; n <= MAX_ATTEMPTS; n++) {
    rec.attempts = n;
    let r: Attempt<T>;
    try {
      r = await attempt(AbortSignal.timeout(REQUEST_TIMEOUT_MS));
    } catch (e) {
      r = { ack: false, retry: true, detail: e instanceof Error ? `${e.name}: ${e.message}` : String(e) };
    }
    if (r.ack) {
      rec.outcome = "acked";
      return r.value;
    }
    rec.detail = r.detail;
    if (!r.retry) {
      rec.outcome = "refused";
      violation(`${kind} ${key}: unexpected answer ${r.detail}`);
      return null;
    }
    if (Date.now() - startedAt > RUN_DEADLINE_MS) break;
    await sleep(Math.min(3000, 150 * 2 ** (n - 1)) * (0.5 + Math.random()));
  }
  violation(`${kind} ${key}: never acknowledged after ${rec.attempts} attempts (last: ${rec.detail})`);
  return null;
}

async function answer<T>(res: Response, ok: (status: number, body: unknown) => T | undefined): Promise<Attempt<T>> {
  const text = await res.text();
  let body: unknown = text;
  try {
    body = JSON.parse(text);
  } catch {
    // not JSON (e.g. a proxy page): kept as text for the detail
  }
  const value = ok(res.status, body);
  if (value !== undefined) return { ack: true, value };
  return { ack: false, retry: retryable(res.status), detail: `${res.status} ${text.slice(0, 200)}` };
}

// ---- the run ----

async function main() {
  const skipBuild = process.argv.includes("--skip-build");
  const distDir = process.env.BANDEDGE_TEST_DIST ?? ".next-faults";
  // The app's output (stack traces while PostgreSQL is down, mostly) goes to a file, kept when a check fails.
  const appLog = join(tmpdir(), `bandedge-faults-app-${process.pid}.log`);
  const stack: Stack = await bootScratchStack({
    distDir,
    build: !skipBuild || !existsSync(join(distDir, "BUILD_ID")),
    durable: true,
    quiet: true,
    appLog,
  });
  let app: ChildProcess = stack.app;
  let dual: ChildProcess | undefined;
  const expectedExits = new WeakSet<ChildProcess>();
  const watch = (child: ChildProcess) =>
    child.on("exit", (code, signal) => {
      if (expectedExits.has(child)) return;
      counts.appCrashes++;
      violation(`the app exited by itself (code ${code}, signal ${signal}) at ${((Date.now() - startedAt) / 1000).toFixed(1)} s`);
    });
  watch(app);
  const stopAll = () => {
    expectedExits.add(app);
    if (dual) expectedExits.add(dual);
    stack.stop();
  };
  process.on("SIGINT", () => {
    stopAll();
    process.exit(130);
  });

  try {
    Object.assign(process.env, stack.env);
    const fsync = stack.cluster.setting("fsync");
    const syncCommit = stack.cluster.setting("synchronous_commit");
    const fpw = stack.cluster.setting("full_page_writes");
    console.log(`PostgreSQL durability settings: fsync=${fsync} synchronous_commit=${syncCommit} full_page_writes=${fpw}`);
    if (fsync !== "on" || syncCommit !== "on" || fpw !== "on") violation("PostgreSQL is not running with its durability settings on");

    const appUrl = stack.appUrl;
    const appPort = Number(new URL(appUrl).port);
    const env = stack.env;
    const db = new pg.Pool({ connectionString: env.DATABASE_URL, max: 6 });
    db.on("error", () => undefined); // idle connections die when PostgreSQL restarts
    const q = async <R extends pg.QueryResultRow>(text: string, values: unknown[] = []) => (await db.query<R>(text, values)).rows;

    // ---- preparation (before any fault) ----
    const prepStart = Date.now();
    const { newCustomer } = await import("../tests/support/accounts");
    const { createCertificate, IDS, stopQueue } = await import("../tests/integration/certificates-fixtures");
    const { closeTestPool } = await import("../tests/support/db");
    const { pool: appPool } = await import("@/db");

    const customers: Client[] = [];
    for (let i = 0; i < CUSTOMERS; i++) {
      const c = await newCustomer(`faults${i}`);
      const client = new Client(appUrl, c.email);
      const res = await client.request("/api/auth/sign-in/email", { method: "POST", json: { email: c.email, password: c.password } });
      if (!res.ok) throw new Error(`sign-in failed for ${c.email}: ${res.status}`);
      const [u] = await q<{ id: string }>(`select id from "user" where email = $1`, [c.email]);
      client.userId = u!.id;
      customers.push(client);
    }
    const holders: Client[] = [];
    for (const [email, id] of [
      ["mira.holloway@example.com", IDS.mira],
      ["jonah.pell@example.com", IDS.jonah],
    ] as const) {
      const client = new Client(appUrl, email, id);
      const res = await client.request("/api/auth/sign-in/email", { method: "POST", json: { email, password: "demo-owner-2026" } });
      if (!res.ok) throw new Error(`sign-in failed for ${email}: ${res.status}`);
      holders.push(client);
    }

    // Jobs waiting for their deposit: an approved revision and a consistent history, as the portal leaves them.
    async function approvedJob(customerId: string): Promise<{ jobId: string; number: number }> {
      const [set] = await q<{ id: string }>(
        `insert into radio_set (owner_id, maker, model, year, kind, profile) values ($1, 'Corvane', 'Seven', 1961, 'transistor-battery', $2) returning id`,
        [
          customerId,
          JSON.stringify({
            kind: "transistor-battery",
            bands: [{ kind: "MW", lowKHz: 530, highKHz: 1610, ifKHz: 455 }],
            electrolytics: 4,
            paperCapacitors: 0,
          }),
        ],
      );
      const [job] = await q<{ id: string; number: number }>(
        `insert into job (set_id, customer_id, state, symptoms) values ($1, $2, 'approved', 'Weak and scratchy, fades after a few minutes.') returning id, number`,
        [set!.id, customerId],
      );
      await q(
        `insert into job_state_history (job_id, from_state, to_state, actor_id, at) values
           ($1, null, 'requested', $2, now() - interval '4 hours'), ($1, 'requested', 'in_triage', null, now() - interval '3 hours'),
           ($1, 'in_triage', 'estimate_sent', null, now() - interval '2 hours'), ($1, 'estimate_sent', 'approved', $2, now() - interval '1 hour')`,
        [job!.id, customerId],
      );
      const [est] = await q<{ id: string }>(
        `insert into estimate (job_id, draft, current_revision) values ($1, '{"lines":[]}', 1) returning id`,
        [job!.id],
      );
      const [rev] = await q<{ id: string }>(
        `insert into estimate_revision (estimate_id, job_id, revision, status, currency, labour_minor, parts_minor, tax_minor, total_minor, deposit_minor, pricing, decided_by, decided_at)
         values ($1, $2, 1, 'approved', 'USD', 18000, 2400, 192, 20592, 6178, '{"exponent":2}', $3, now() - interval '1 hour') returning id`,
        [est!.id, job!.id, customerId],
      );
      await q(
        `insert into estimate_line (revision_id, position, code, title, category, minutes, quantity, reason, labour_minor, parts_minor)
         values ($1, 1, 'recap', 'Replace the electrolytic capacitors', 'recap', 60, 1, 'Dried-out electrolytics', 18000, 2400)`,
        [rev!.id],
      );
      return { jobId: job!.id, number: job!.number };
    }

    async function inParallel<T, R>(items: T[], width: number, fn: (item: T, i: number) => Promise<R>): Promise<R[]> {
      const out: R[] = new Array(items.length);
      let next = 0;
      await Promise.all(
        Array.from({ length: width }, async () => {
          while (next < items.length) {
            const i = next++;
            out[i] = await fn(items[i]!, i);
          }
        }),
      );
      return out;
    }

    const payJobs = await inParallel(
      Array.from({ length: PAYMENTS }, (_, i) => customers[i % CUSTOMERS]!),
      6,
      async (c) => ({ client: c, ...(await approvedJob(c.userId)) }),
    );
    const dualJobs = await inParallel(
      Array.from({ length: DUAL_EVENTS }, (_, i) => customers[i % CUSTOMERS]!),
      6,
      async (c) => ({ client: c, ...(await approvedJob(c.userId)) }),
    );
    const certs = await inParallel(
      Array.from({ length: CLAIMS }, (_, i) => holders[i % holders.length]!),
      4,
      async (holder) => {
        const c = await createCertificate({ customerId: holder.userId, maker: "Aurelian", model: "Model 5T" });
        return { holder, certificateId: c.certificateId, jobId: c.jobId };
      },
    );
    const fixtureJobs = new Set(certs.map((c) => c.jobId)); // written straight into the tables, without history
    await stopQueue();
    await closeTestPool();
    await appPool().end();
    const photo = await sharp({ create: { width: 320, height: 240, channels: 3, background: { r: 120, g: 86, b: 52 } } })
      .jpeg({ quality: 80 })
      .toBuffer();
    console.log(
      `Prepared ${CUSTOMERS} customers, ${PAYMENTS + DUAL_EVENTS} approved jobs and ${CLAIMS} certificates in ${((Date.now() - prepStart) / 1000).toFixed(1)} s`,
    );

    // ---- the ledger ----
    const ledger = {
      uploads: [] as { key: string; storageKey: string }[],
      quotes: [] as { customerId: string; key: string; jobId: string; storageKey: string }[],
      checkouts: [] as { jobId: string; sessionId: string }[],
      webhooks: new Map<string, { jobId: string; sessionId: string }>(),
      claims: [] as { certificateId: string; marker: string }[],
      messages: [] as { marker: string; key: string; jobId: string; authorId: string; messageId: string; repeat: boolean }[],
      messagesGivenUp: [] as { marker: string; key: string }[],
    };

    const signer = new Stripe("sk_test_fault_signer");
    const deliverTo = (base: string, payload: string, signal?: AbortSignal) =>
      fetch(`${base}/api/webhooks/stripe`, {
        method: "POST",
        headers: {
          "content-type": "application/json",
          "stripe-signature": signer.webhooks.generateTestHeaderString({ payload, secret: env.STRIPE_WEBHOOK_SECRET }),
        },
        body: payload,
        signal,
      });

    const ticketStorageKey = (ticket: string) =>
      (JSON.parse(Buffer.from(ticket.split(".")[0]!, "base64url").toString("utf8")) as { key: string }).key;

    async function upload(client: Client): Promise<string | null> {
      return perform("upload", `upload:${randomUUID()}`, async (signal) => {
        const res = await client.request("/api/uploadthing?actionType=upload&slug=quotePhotos", {
          method: "POST",
          json: { files: [{ name: "front.jpg", size: photo.length, type: "image/jpeg", lastModified: Date.now() }], input: null },
          headers: { "x-uploadthing-package": "bandedge-faults", "x-uploadthing-version": "7.7.4" },
          signal,
        });
        if (!res.ok) return answer<string>(res, () => undefined);
        const [presigned] = (await res.json()) as { url: string; key: string }[];
        await fetch(presigned!.url, { method: "HEAD", signal });
        const form = new FormData();
        form.append("file", new Blob([new Uint8Array(photo)], { type: "image/jpeg" }), "front.jpg");
        const put = await fetch(presigned!.url, { method: "PUT", body: form, headers: { range: "bytes=0-" }, signal });
        const body = (await put.json()) as { error?: string; serverData?: { ok: boolean; ticket?: string; error?: string } | null };
        if (body.serverData?.ok && body.serverData.ticket) return { ack: true, value: body.serverData.ticket };
        if (body.serverData && !body.serverData.ok) return { ack: false, retry: false, detail: `photo refused: ${body.serverData.error}` };
        return { ack: false, retry: true, detail: `upload not confirmed: ${put.status} ${body.error ?? ""}` };
      });
    }

    async function quoteTask(client: Client) {
      const ticket = await upload(client);
      if (!ticket) return;
      const storageKey = ticketStorageKey(ticket);
      ledger.uploads.push({ key: ticket, storageKey });
      const key = randomUUID();
      const body = {
        maker: "Haldane",
        model: "Console 8",
        year: "1956",
        serial: "",
        kind: "tube-transformer",
        bands: ["MW", "SW", "FM"],
        dialMarkings: "",
        symptoms: "The FM band is silent and the short-wave bands drift after warming up.",
        priorWork: "",
        poweredRecently: "no",
        delivery: "drop-off",
        contactPreference: "email",
        phone: "",
        cautionsAcknowledged: true,
        photos: [ticket],
        idempotencyKey: key,
      };
      const jobId = await perform("quote", key, async (signal) =>
        answer(await client.request("/api/portal/jobs", { method: "POST", json: body, signal }), (status, b) =>
          status === 201 || status === 200 ? (b as { jobId: string }).jobId : undefined,
        ),
      );
      if (jobId) ledger.quotes.push({ customerId: client.userId, key, jobId, storageKey });
    }

    async function paymentTask(job: { client: Client; jobId: string }, enqueue: (t: () => Promise<void>) => void) {
      const url = await perform("checkout", `checkout:${job.jobId}`, async (signal) =>
        answer(
          await job.client.request("/api/payments/checkout", { method: "POST", json: { jobId: job.jobId, purpose: "deposit" }, signal }),
          (status, b) => {
            const r = b as { kind?: string; url?: string };
            return status === 200 && r.kind === "redirect" && r.url ? r.url : undefined;
          },
        ),
      );
      if (!url) return;
      const sessionId = /\/checkout\/(cs_[A-Za-z0-9_]+)/.exec(url)?.[1];
      if (!sessionId) return violation(`checkout for ${job.jobId} gave a URL that is not the stand-in's: ${url}`);
      ledger.checkouts.push({ jobId: job.jobId, sessionId });
      // The payer pays at the stand-in (not faulted); its delivery is held so this client delivers it.
      let payload: string | undefined;
      for (let n = 0; n < 10 && !payload; n++) {
        try {
          const paid = await fetch(`${env.STRIPE_API_BASE}/checkout/${sessionId}/pay`, {
            method: "POST",
            headers: { "content-type": "application/x-www-form-urlencoded" },
            body: new URLSearchParams({ outcome: "succeed", deliver: "hold" }),
            redirect: "manual",
          });
          await paid.text();
          const events = (await (
            await fetch(`${env.STRIPE_API_BASE}/control/events?session=${sessionId}&type=checkout.session.completed`)
          ).json()) as { data: { payload: string }[] };
          payload = events.data[0]?.payload;
        } catch {
          await sleep(200);
        }
      }
      if (!payload) return violation(`the stand-in has no completed event for ${sessionId}`);
      const eventId = (JSON.parse(payload) as { id: string }).id;
      ledger.webhooks.set(eventId, { jobId: job.jobId, sessionId });
      const deliverOnce = async () => {
        await perform("webhook", eventId, async (signal) =>
          answer(await deliverTo(appUrl, payload!, signal), (status) => (status === 200 ? true : undefined)),
        );
      };
      await deliverOnce();
      enqueue(deliverOnce); // the processor delivers again later
    }

    async function claimTask(cert: { holder: Client; certificateId: string }) {
      const marker = randomUUID();
      const ok = await perform("claim", `claim:${cert.certificateId}`, async (signal) =>
        answer(
          await cert.holder.request("/api/claims", {
            method: "POST",
            json: {
              certificateId: cert.certificateId,
              symptomCategory: "hum",
              description: `A hum comes back after warming up. Ref ${marker}`,
              statements: [],
            },
            signal,
          }),
          // A 409 from the one-open-claim rule proves an earlier attempt's claim exists.
          (status, b) => (status === 201 || (status === 409 && /already an open claim/.test(JSON.stringify(b))) ? true : undefined),
        ),
      );
      if (ok) ledger.claims.push({ certificateId: cert.certificateId, marker });
    }

    async function messageTask(job: { client: Client; jobId: string }) {
      const marker = randomUUID();
      // One key per message, as the portal's composer keeps it: every retry of this message sends it again.
      const key = randomUUID();
      const text = `Is there anything you need from me before the set goes in? Ref ${marker}`;
      const stored = await perform("message", key, async (signal) =>
        answer(
          await job.client.request(`/api/portal/jobs/${job.jobId}/messages`, {
            method: "POST",
            json: { body: text, idempotencyKey: key },
            signal,
          }),
          (status, b) =>
            // 201 stored now; 200 stored by an earlier attempt whose answer was lost.
            status === 201 || status === 200 ? { id: (b as { id: string }).id, repeat: status === 200 } : undefined,
        ),
      );
      if (stored)
        ledger.messages.push({ marker, key, jobId: job.jobId, authorId: job.client.userId, messageId: stored.id, repeat: stored.repeat });
      else ledger.messagesGivenUp.push({ marker, key });
    }

    // ---- tasks, workers and the fault schedule ----
    const tasks: (() => Promise<void>)[] = [];
    for (let i = 0; i < QUOTES; i++) tasks.push(() => quoteTask(customers[i % CUSTOMERS]!));
    for (const j of payJobs)
      tasks.push(() => paymentTask(j, (t) => tasks.splice(Math.min(tasks.length, next + 20 + Math.floor(Math.random() * 200)), 0, t)));
    for (const c of certs) tasks.push(() => claimTask(c));
    for (let i = 0; i < MESSAGES; i++) tasks.push(() => messageTask(payJobs[i % payJobs.length]!));
    for (let i = tasks.length - 1; i > 0; i--) {
      const k = Math.floor(Math.random() * (i + 1));
      [tasks[i], tasks[k]] = [tasks[k]!, tasks[i]!];
    }
    const plannedTasks = tasks.length + PAYMENTS; // the redeliveries join the queue as the run goes
    let next = 0;
    let finished = 0;

    async function restartApp(reason: string) {
      const old = app;
      expectedExits.add(old);
      const gone = new Promise((r) => (old.exitCode !== null || old.signalCode !== null ? r(null) : old.once("exit", r)));
      old.kill("SIGKILL");
      await gone;
      counts.kills++;
      const t0 = Date.now();
      console.log(`  ⚡ SIGKILL the app (${reason}) after ${finished} of ${plannedTasks} tasks`);
      await sleep(500);
      app = stack.startApp(appPort);
      watch(app);
      await waitForHttp(`${appUrl}/api/health`, 120_000);
      counts.appRestarts++;
      console.log(`    app answering again after ${((Date.now() - t0) / 1000).toFixed(1)} s`);
    }

    async function restartPostgres() {
      const t0 = Date.now();
      console.log(`  ⚡ PostgreSQL stopped in immediate mode after ${finished} of ${plannedTasks} tasks`);
      stack.cluster.stop("immediate");
      await sleep(1000);
      stack.cluster.start();
      counts.pgRestarts++;
      console.log(`    PostgreSQL up again after ${((Date.now() - t0) / 1000).toFixed(1)} s (crash recovery from the WAL)`);
    }

    let loadDone = false;
    const faulter = (async () => {
      for (const f of FAULTS) {
        while (!loadDone && finished < f.at * plannedTasks) await sleep(50);
        if (loadDone) {
          violation(`the load ended before the ${f.kind} fault could be injected`);
          continue;
        }
        if (f.kind === "app") await restartApp(`fault ${counts.kills + 1}`);
        else await restartPostgres();
      }
    })();

    const loadStart = Date.now();
    console.log(
      `Load: ${plannedTasks} tasks through ${WORKERS} workers, faults at ${FAULTS.map((f) => `${Math.round(f.at * 100)} % (${f.kind})`).join(", ")}`,
    );
    await Promise.all(
      Array.from({ length: WORKERS }, async () => {
        while (next < tasks.length) {
          const task = tasks[next++]!;
          try {
            await task();
          } catch (e) {
            violation(`a task failed outside its operations: ${e instanceof Error ? e.stack : String(e)}`);
          }
          finished++;
        }
      }),
    );
    loadDone = true;
    await faulter;
    const loadSeconds = (Date.now() - loadStart) / 1000;
    // A crash on the PostgreSQL restart shows up here even if it came late.
    if (app.exitCode !== null || app.signalCode !== null) {
      app = stack.startApp(appPort);
      watch(app);
      await waitForHttp(`${appUrl}/api/health`, 120_000);
    }

    // ---- two instances, one database, the same webhook at the same moment ----
    const dualPort = await freePort();
    dual = stack.startApp(dualPort, { name: "app-2" });
    watch(dual);
    const dualUrl = `http://127.0.0.1:${dualPort}`;
    await waitForHttp(`${dualUrl}/api/health`, 120_000);
    const dualResults: { jobId: string; eventId: string; outcomes: string[]; statuses: number[] }[] = [];
    for (const job of dualJobs) {
      const res = await job.client.request("/api/payments/checkout", { method: "POST", json: { jobId: job.jobId, purpose: "deposit" } });
      const out = (await res.json()) as { url?: string };
      const sessionId = /\/checkout\/(cs_[A-Za-z0-9_]+)/.exec(out.url ?? "")?.[1];
      if (!sessionId) {
        violation(`two instances: no checkout for ${job.jobId} (${res.status})`);
        continue;
      }
      await fetch(`${env.STRIPE_API_BASE}/checkout/${sessionId}/pay`, {
        method: "POST",
        headers: { "content-type": "application/x-www-form-urlencoded" },
        body: new URLSearchParams({ outcome: "succeed", deliver: "hold" }),
        redirect: "manual",
      });
      const events = (await (
        await fetch(`${env.STRIPE_API_BASE}/control/events?session=${sessionId}&type=checkout.session.completed`)
      ).json()) as { data: { id: string; payload: string }[] };
      const ev = events.data[0];
      if (!ev) {
        violation(`two instances: no event for ${sessionId}`);
        continue;
      }
      const answers = await Promise.all(
        [appUrl, dualUrl].flatMap((base) =>
          Array.from({ length: DUAL_DELIVERIES_PER_INSTANCE }, () => deliverTo(base, ev.payload, AbortSignal.timeout(REQUEST_TIMEOUT_MS))),
        ),
      );
      const bodies = await Promise.all(answers.map(async (r) => ((await r.json()) as { outcome?: string }).outcome ?? "?"));
      dualResults.push({ jobId: job.jobId, eventId: ev.id, outcomes: bodies, statuses: answers.map((r) => r.status) });
    }

    // ---- checks ----
    console.log("Checking…");
    // Let the e-mail queue drain (bounded): every message is either sent or still queued with a live job.
    // A message whose worker was killed mid-send waits for the queue's job expiry before it is retried, so
    // stop waiting once the count stops falling and everything left has a live queue job.
    const drainDeadline = Date.now() + 90_000;
    let lastQueued = -1;
    let steadySince = Date.now();
    while (Date.now() < drainDeadline) {
      const [row] = await q<{ n: number; orphans: number }>(
        `select count(*)::int as n,
                count(*) filter (where not exists (select 1 from pgboss.job b where b.data->>'outboxId' = o.id::text and b.state in ('created', 'retry', 'active')))::int as orphans
           from email_outbox o where o.status = 'queued'`,
      );
      if (row!.n === 0) break;
      if (row!.n !== lastQueued) {
        lastQueued = row!.n;
        steadySince = Date.now();
      } else if (row!.orphans === 0 && Date.now() - steadySince > 10_000) break;
      await sleep(1000);
    }

    const acked = (kind: Kind) => ops.filter((o) => o.kind === kind && o.outcome === "acked");

    // Quote requests: one job per (customer, key), the one acknowledged, with its photo and its e-mail.
    const quoteRows = await q<{ key: string; n: number; ids: string[]; photo_ok: boolean; mail: string | null; created: boolean }>(
      `select l.key, count(j.id)::int as n, array_agg(j.id::text) filter (where j.id is not null) as ids,
              bool_or(p.job_id = j.id) as photo_ok,
              max(o.status::text) as mail,
              bool_or(h.from_state is null and h.to_state = 'requested') as created
         from unnest($1::text[], $2::text[], $3::text[]) as l(cust, key, storage_key)
         left join job j on j.customer_id = l.cust and j.idempotency_key = l.key
         left join photo p on p.storage_key = l.storage_key
         left join email_outbox o on o.dedupe_key = 'quote-received:' || j.id::text
         left join job_state_history h on h.job_id = j.id
        group by l.key`,
      [ledger.quotes.map((x) => x.customerId), ledger.quotes.map((x) => x.key), ledger.quotes.map((x) => x.storageKey)],
    );
    const quoteByKey = new Map(ledger.quotes.map((x) => [x.key, x]));
    let jobCountCheck = 0;
    for (const r of quoteRows) {
      const want = quoteByKey.get(r.key)!;
      if (r.n < 1) violation(`quote ${r.key}: acknowledged but no job`);
      else if (new Set(r.ids).size !== 1) violation(`quote ${r.key}: ${new Set(r.ids).size} jobs for one key`);
      else if (r.ids[0] !== want.jobId) violation(`quote ${r.key}: the job is ${r.ids[0]}, the answer said ${want.jobId}`);
      else jobCountCheck++;
      if (!r.photo_ok) violation(`quote ${r.key}: its photo is not attached to the job`);
      if (r.mail !== "queued" && r.mail !== "sent") violation(`quote ${r.key}: the "quote received" e-mail is ${r.mail ?? "missing"}`);
      if (!r.created) violation(`quote ${r.key}: no creation row in the history`);
    }
    const [dupKeys] = await q<{ n: number }>(
      `select count(*)::int as n from (select 1 from job where idempotency_key is not null group by customer_id, idempotency_key having count(*) > 1) d`,
    );
    if (dupKeys!.n > 0) violation(`${dupKeys!.n} idempotency keys have more than one job`);

    // Uploads: the re-encoded photo behind every acknowledged ticket is in the store.
    // Photos live in the upload store (the stand-in keeps each under its custom id: the key, slash made a dash).
    const storeRoot = join(env.UPLOAD_DIR!, "ingest");
    const missingFiles = ledger.uploads.filter((u) => !existsSync(join(storeRoot, u.storageKey.replace("/", "-"))));
    for (const u of missingFiles.slice(0, 10)) violation(`upload ${u.storageKey}: acknowledged but the stored photo is missing`);
    if (missingFiles.length > 10) violation(`${missingFiles.length} acknowledged uploads have no stored photo`);

    // Checkouts: one payment row per acknowledged session, one checkout per job.
    const checkoutRows = await q<{ session: string; n: number; per_job: number }>(
      `select l.session, count(p.id)::int as n, (select count(*)::int from payment x where x.job_id = l.job::uuid) as per_job
         from unnest($1::text[], $2::text[]) as l(session, job) left join payment p on p.checkout_session_id = l.session group by l.session, l.job`,
      [ledger.checkouts.map((c) => c.sessionId), ledger.checkouts.map((c) => c.jobId)],
    );
    for (const r of checkoutRows) {
      if (r.n !== 1) violation(`checkout ${r.session}: ${r.n} payment rows`);
      if (r.per_job !== 1) violation(`checkout ${r.session}: its job has ${r.per_job} payment rows`);
    }

    // Webhooks: each acknowledged event id stored once; its payment paid once; the job moved once; one receipt.
    const eventIds = [...new Set(acked("webhook").map((o) => o.key))];
    const hookRows = await q<{ id: string; n: number; status: string | null; state: string | null; moves: number; receipts: number }>(
      `select l.id, (select count(*)::int from payment_event e where e.id = l.id) as n, p.status::text as status, j.state::text as state,
              (select count(*)::int from job_state_history h where h.job_id = j.id and h.from_state = 'approved' and h.to_state = 'deposit_paid') as moves,
              (select count(*)::int from email_outbox o where o.dedupe_key = 'receipt:' || p.id::text and o.status in ('queued', 'sent')) as receipts
         from unnest($1::text[], $2::text[]) as l(id, session)
         left join payment p on p.checkout_session_id = l.session
         left join job j on j.id = p.job_id`,
      [eventIds, eventIds.map((id) => ledger.webhooks.get(id)!.sessionId)],
    );
    for (const r of hookRows) {
      if (r.n !== 1) violation(`webhook ${r.id}: stored ${r.n} times`);
      if (r.status !== "paid") violation(`webhook ${r.id}: payment is ${r.status}`);
      if (r.state !== "deposit_paid") violation(`webhook ${r.id}: job is ${r.state}`);
      if (r.moves !== 1) violation(`webhook ${r.id}: ${r.moves} approved → deposit_paid moves`);
      if (r.receipts !== 1) violation(`webhook ${r.id}: ${r.receipts} receipts`);
    }

    // Claims: one open claim per certificate, the acknowledged one.
    const claimRows = await q<{ certificate_id: string; n: number; open: number; mine: number }>(
      `select l.cert as certificate_id, count(c.id)::int as n, count(c.id) filter (where c.status = 'open')::int as open,
              count(c.id) filter (where c.description like '%' || l.marker)::int as mine
         from unnest($1::uuid[], $2::text[]) as l(cert, marker) left join claim c on c.certificate_id = l.cert group by l.cert`,
      [ledger.claims.map((c) => c.certificateId), ledger.claims.map((c) => c.marker)],
    );
    for (const r of claimRows)
      if (r.n !== 1 || r.open !== 1 || r.mine !== 1)
        violation(`claim on ${r.certificate_id}: ${r.n} claims, ${r.open} open, ${r.mine} with our text`);

    // Messages: every retry carried the message's idempotency key, so each acknowledged message is stored
    // exactly once, under its key, as the message the answer named, with one audit entry; one never
    // acknowledged is stored at most once.
    const allMarkers = [...ledger.messages.map((m) => m.marker), ...ledger.messagesGivenUp.map((m) => m.marker)];
    const msgRows = await q<{
      marker: string;
      n: number;
      ids: string[] | null;
      keys: (string | null)[] | null;
      authors: string[] | null;
      audits: number;
    }>(
      `select l.marker, count(m.id)::int as n, array_agg(m.id::text) filter (where m.id is not null) as ids,
              array_agg(m.idempotency_key) filter (where m.id is not null) as keys,
              array_agg(m.author_id) filter (where m.id is not null) as authors,
              (select count(*)::int from audit_event a where a.entity = 'message' and a.entity_id in (select x.id::text from message x where x.body like '%Ref ' || l.marker)) as audits
         from unnest($1::text[]) as l(marker) left join message m on m.body like '%Ref ' || l.marker group by l.marker`,
      [allMarkers],
    );
    const msgByMarker = new Map(msgRows.map((r) => [r.marker, r]));
    let messageDuplicates = 0;
    for (const m of ledger.messages) {
      const r = msgByMarker.get(m.marker);
      const n = r?.n ?? 0;
      if (n < 1) violation(`message ${m.marker}: acknowledged but missing`);
      else if (n > 1) violation(`message ${m.marker}: acknowledged once but stored ${n} times`);
      else if (r!.ids![0] !== m.messageId) violation(`message ${m.marker}: stored as ${r!.ids![0]}, the answer said ${m.messageId}`);
      else if (r!.keys![0] !== m.key) violation(`message ${m.marker}: stored under key ${r!.keys![0]}, sent with ${m.key}`);
      else if (r!.authors![0] !== m.authorId)
        violation(`message ${m.marker}: stored as written by ${r!.authors![0]}, sent by ${m.authorId}`);
      if (r && r.audits !== n) violation(`message ${m.marker}: ${r.audits} audit entries for ${n} stored`);
      if (n > 1) messageDuplicates += n - 1;
    }
    for (const m of ledger.messagesGivenUp) {
      const n = msgByMarker.get(m.marker)?.n ?? 0;
      if (n > 1) violation(`message ${m.marker}: never acknowledged, yet stored ${n} times`);
      if (n > 1) messageDuplicates += n - 1;
    }
    const [dupMessageKeys] = await q<{ n: number }>(
      `select count(*)::int as n from (select 1 from message where idempotency_key is not null group by author_id, job_id, idempotency_key having count(*) > 1) d`,
    );
    if (dupMessageKeys!.n > 0) violation(`${dupMessageKeys!.n} message idempotency keys have more than one message`);

    // Invariants over the whole database.
    const [twoPaid] = await q<{ n: number }>(
      `select count(*)::int as n from (select 1 from payment where status = 'paid' group by revision_id, purpose having count(*) > 1) d`,
    );
    if (twoPaid!.n > 0) violation(`${twoPaid!.n} revisions have more than one paid payment of one purpose`);
    const jobsAll = await q<{ id: string; state: JobState }>(`select id, state from job`);
    const hist = await q<{ job_id: string; from_state: JobState | null; to_state: JobState; at: Date }>(
      `select job_id, from_state, to_state, at from job_state_history order by job_id, at`,
    );
    const byJob = new Map<string, typeof hist>();
    for (const h of hist) byJob.set(h.job_id, [...(byJob.get(h.job_id) ?? []), h]);
    let chainsChecked = 0;
    for (const j of jobsAll) {
      const rows = byJob.get(j.id) ?? [];
      if (rows.length === 0) {
        if (!fixtureJobs.has(j.id)) violation(`job ${j.id} (${j.state}) has no history`);
        continue;
      }
      // Walk the chain in time order; rows written in one transaction share a timestamp, so among equal
      // timestamps take the row that continues the chain.
      const left = [...rows];
      let state: JobState | null = null;
      let ok = true;
      while (left.length) {
        const t = left[0]!.at.getTime();
        const i = left.findIndex((r) => r.at.getTime() === t && r.from_state === state);
        if (i < 0) {
          violation(`job ${j.id}: history breaks after ${state ?? "(start)"}: next row is ${left[0]!.from_state} → ${left[0]!.to_state}`);
          ok = false;
          break;
        }
        const r = left.splice(i, 1)[0]!;
        const legal = state === null ? r.to_state === "requested" : TRANSITIONS[state]?.[r.to_state] !== undefined;
        if (!legal) {
          violation(`job ${j.id}: ${state ?? "(start)"} → ${r.to_state} is not a legal move`);
          ok = false;
          break;
        }
        state = r.to_state;
      }
      if (ok && state !== j.state) violation(`job ${j.id}: state ${j.state} but its history ends at ${state}`);
      if (ok) chainsChecked++;
    }

    // The outbox: nothing failed; anything still queued has a live queue job (delayed, not lost); everything
    // sent reached the mail stand-in.
    const outbox = await q<{ id: string; status: string; live: boolean }>(
      `select o.id, o.status::text as status,
              exists (select 1 from pgboss.job b where b.data->>'outboxId' = o.id::text and b.state in ('created', 'retry', 'active')) as live
         from email_outbox o`,
    );
    const mailbox = (await (await fetch(`${env.MAILBOX_URL}/messages`)).json()) as { data: { idempotencyKey?: string; subject: string }[] };
    const deliveredKeys = new Map<string, number>();
    for (const m of mailbox.data) if (m.idempotencyKey) deliveredKeys.set(m.idempotencyKey, (deliveredKeys.get(m.idempotencyKey) ?? 0) + 1);
    let queuedLive = 0;
    for (const o of outbox) {
      if (o.status === "failed") violation(`e-mail ${o.id} failed`);
      else if (o.status === "queued" && !o.live) violation(`e-mail ${o.id} is queued with no queue job: it will never be sent`);
      else if (o.status === "queued") queuedLive++;
      else if (o.status === "sent" && deliveredKeys.get(`outbox-${o.id}`) !== 1)
        violation(`e-mail ${o.id} is marked sent but the mail service has ${deliveredKeys.get(`outbox-${o.id}`) ?? 0} copies`);
    }

    // Two instances: one payment, one state change, one e-mail per event.
    for (const d of dualResults) {
      const [r] = await q<{ events: number; paid: number; moves: number; receipts: number; subj: string }>(
        `select (select count(*)::int from payment_event where id = $2) as events,
                (select count(*)::int from payment where job_id = $1 and status = 'paid') as paid,
                (select count(*)::int from job_state_history where job_id = $1 and to_state = 'deposit_paid') as moves,
                (select count(*)::int from email_outbox o join payment p on o.dedupe_key = 'receipt:' || p.id::text where p.job_id = $1) as receipts,
                (select 'Deposit received for KL-' || lpad(number::text, 4, '0') from job where id = $1) as subj`,
        [d.jobId, d.eventId],
      );
      const mails = mailbox.data.filter((m) => m.subject === r!.subj).length;
      const applied = d.outcomes.filter((o) => o === "paid").length;
      if (d.statuses.some((s) => s !== 200)) violation(`two instances, ${d.eventId}: answers ${d.statuses.join(", ")}`);
      if (r!.events !== 1 || r!.paid !== 1 || r!.moves !== 1 || r!.receipts !== 1 || applied !== 1) {
        violation(
          `two instances, ${d.eventId}: ${r!.events} events, ${r!.paid} paid, ${r!.moves} state changes, ${r!.receipts} receipts, applied ${applied}× (${d.outcomes.join(", ")})`,
        );
      }
      if (mails > 1) violation(`two instances, ${d.eventId}: ${mails} receipts at the mail service`);
    }

    await db.end();

    // The faults must have happened and bitten, or this run proved nothing.
    if (counts.kills !== 2 || counts.appRestarts !== 2)
      violation(`expected 2 kills and restarts of the app, got ${counts.kills} and ${counts.appRestarts}`);
    if (counts.pgRestarts !== 1) violation(`expected 1 PostgreSQL restart, got ${counts.pgRestarts}`);
    if (!ops.some((o) => o.attempts > 1)) violation("no operation needed a retry: the faults did not reach the load");

    // ---- report ----
    const kinds: Kind[] = ["upload", "quote", "checkout", "webhook", "claim", "message"];
    console.log("\nOperations under faults");
    console.log("kind        ops   acked  retried  attempts");
    for (const k of kinds) {
      const list = ops.filter((o) => o.kind === k);
      console.log(
        `${k.padEnd(10)} ${String(list.length).padStart(5)} ${String(list.filter((o) => o.outcome === "acked").length).padStart(7)} ${String(list.filter((o) => o.attempts > 1).length).padStart(8)} ${String(list.reduce((s, o) => s + o.attempts, 0)).padStart(9)}`,
      );
    }
    const summary = {
      operations: ops.length,
      acknowledged: ops.filter((o) => o.outcome === "acked").length,
      retried: ops.filter((o) => o.attempts > 1).length,
      attempts: ops.reduce((s, o) => s + o.attempts, 0),
      kills: counts.kills,
      appRestarts: counts.appRestarts,
      pgRestarts: counts.pgRestarts,
      appCrashes: counts.appCrashes,
      jobsChecked: jobCountCheck,
      eventsChecked: hookRows.length,
      claimsChecked: claimRows.length,
      messagesChecked: ledger.messages.length,
      messagesRetried: acked("message").filter((o) => o.attempts > 1).length,
      messagesRecognisedAsRepeats: ledger.messages.filter((m) => m.repeat).length,
      messageDuplicates,
      historyChainsChecked: chainsChecked,
      outboxRows: outbox.length,
      outboxStillQueued: queuedLive,
      dualEvents: dualResults.length,
      dualDeliveries: dualResults.reduce((s, d) => s + d.statuses.length, 0),
      loadSeconds: Math.round(loadSeconds),
      totalSeconds: Math.round((Date.now() - startedAt) / 1000),
      violations: violations.length,
    };
    console.log(
      `\n${summary.operations} operations, ${summary.acknowledged} acknowledged, ${summary.retried} retried (${summary.attempts} attempts); ` +
        `${summary.kills} SIGKILLs, ${summary.appRestarts} app restarts, ${summary.pgRestarts} PostgreSQL immediate restart; ` +
        `${summary.messagesChecked} messages stored exactly once under their keys (${summary.messagesRetried} retried, ${summary.messagesRecognisedAsRepeats} answered as a repeat of a stored one, ${summary.messageDuplicates} duplicates); ${summary.outboxStillQueued} e-mails still queued with a live job; ` +
        `two instances: ${summary.dualEvents} events × ${DUAL_DELIVERIES_PER_INSTANCE * 2} simultaneous deliveries; load ${summary.loadSeconds} s, total ${summary.totalSeconds} s`,
    );
    console.log(`FAULT-TEST-SUMMARY ${JSON.stringify(summary)}`);
    if (violations.length) {
      console.log(`\nThe app's output is in ${appLog}`);
      console.log(`\n${violations.length} violation(s):`);
      for (const v of violations.slice(0, 60)) console.log(`  ✕ ${v}`);
    } else {
      console.log("\nEvery acknowledged write is present exactly once and every invariant holds.");
      rmSync(appLog, { force: true });
    }
  } finally {
    stopAll();
  }
  process.exit(violations.length ? 1 : 0);
}

main().catch((e) => {
  console.error(e instanceof Error ? e.stack : e);
  process.exit(1);
});
