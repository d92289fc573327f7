// Local stand-in for the part of the Stripe API Bandedge uses through the stripe SDK:
//   POST /v1/checkout/sessions, GET /v1/checkout/sessions/:id, POST /v1/checkout/sessions/:id/expire,
//   GET /v1/payment_intents/:id, POST /v1/refunds, GET /v1/refunds/:id, GET /v1/refunds?payment_intent=,
// a small hosted checkout page (/checkout/:id) where the payer succeeds, is declined, or pays with a delayed
// confirmation, and signed webhook deliveries to the app with retries and back-off on non-2xx answers.
// Control endpoints (/control/*) let the tests hold deliveries, read the signed events and make the API fail.
// Loopback only; state is kept in STRIPE_STANDIN_STATE_DIR so a restart keeps sessions.
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { join } from "node:path";
import Stripe from "stripe";

const port = Number(process.env.STRIPE_STANDIN_PORT ?? 4020);
const webhookUrl = process.env.STRIPE_STANDIN_WEBHOOK_URL ?? "http://127.0.0.1:3000/api/webhooks/stripe";
const secretKey = process.env.STRIPE_SECRET_KEY ?? "";
const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET ?? "";
const stateDir = process.env.STRIPE_STANDIN_STATE_DIR;
const retryBaseMs = Number(process.env.STRIPE_STANDIN_RETRY_BASE_MS ?? 1000);
const maxAttempts = Number(process.env.STRIPE_STANDIN_MAX_ATTEMPTS ?? 8);
const asyncDelayMs = Number(process.env.STRIPE_STANDIN_ASYNC_DELAY_MS ?? 3000);
const API_VERSION = "2026-10-28.endive";
const signer = new Stripe(secretKey || "sk_test_standin");

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };
type Obj = { [k: string]: Json };

type Session = Obj & {
  id: string;
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid" | "no_payment_required";
  amount_total: number;
  currency: string;
  success_url: string;
  cancel_url: string;
  payment_intent: string | null;
  metadata: Obj;
};
type Delivery = { at: string; status: number | null; error?: string };
type StoredEvent = {
  id: string;
  type: string;
  payload: string;
  sessionId: string | null;
  held: boolean;
  deliveries: Delivery[];
  delivered: boolean;
};
type State = {
  sessions: Record<string, Session>;
  intents: Record<string, Obj>;
  charges: Record<string, Obj>;
  refunds: Record<string, Obj>;
  events: StoredEvent[];
  idempotency: Record<string, { status: number; body: Json }>;
};

const stateFile = stateDir ? join(stateDir, "state.json") : null;
let state: State = { sessions: {}, intents: {}, charges: {}, refunds: {}, events: [], idempotency: {} };
if (stateFile && existsSync(stateFile)) {
  try {
    state = JSON.parse(readFileSync(stateFile, "utf8")) as State;
  } catch {
    // a damaged file starts a fresh stand-in
  }
}
function persist() {
  if (!stateFile || !stateDir) return;
  mkdirSync(stateDir, { recursive: true });
  state.events = state.events.slice(-3000);
  writeFileSync(stateFile, JSON.stringify(state));
}

// API faults for the tests, scoped to one job so parallel tests do not see each other's faults.
// "lost-reply" does the work (and sends its events, held back if asked) but never answers in time, as when
// the processor made a refund and the answer was lost on the way back.
type Fault = { mode: "error" | "timeout" | "lost-reply"; remaining: number; match: string; hold: boolean };
let faults: Fault[] = [];

const id = (prefix: string) => `${prefix}_test_${randomBytes(12).toString("hex")}`;
const now = () => Math.floor(Date.now() / 1000);

function send(res: ServerResponse, status: number, body: Json, headers: Record<string, string> = {}) {
  res.writeHead(status, { "content-type": "application/json", "request-id": id("req"), ...headers });
  res.end(JSON.stringify(body));
}
function html(res: ServerResponse, status: number, body: string) {
  res.writeHead(status, { "content-type": "text/html; charset=utf-8", "cache-control": "no-store" });
  res.end(body);
}
function stripeError(res: ServerResponse, status: number, message: string, param?: string, type = "invalid_request_error") {
  send(res, status, { error: { type, message, ...(param ? { param } : {}) } });
}

async function readBody(req: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const c of req) chunks.push(c as Buffer);
  return Buffer.concat(chunks).toString("utf8");
}

// Stripe's form encoding: a[b][0][c]=v → { a: { b: [ { c: "v" } ] } }.
function parseForm(text: string): Obj {
  const out: Obj = {};
  for (const [rawKey, value] of new URLSearchParams(text)) {
    const parts = rawKey.replace(/\]/g, "").split("[");
    let node: Json = out;
    for (let i = 0; i < parts.length; i++) {
      const key = parts[i]!;
      const last = i === parts.length - 1;
      const nextIsIndex = !last && /^\d+$/.test(parts[i + 1]!);
      const container = node as Obj | Json[];
      const slot = Array.isArray(container) ? Number(key) : key;
      if (last) {
        (container as Record<string | number, Json>)[slot] = value;
      } else {
        const existing = (container as Record<string | number, Json>)[slot];
        if (existing === undefined || existing === null || typeof existing !== "object") {
          (container as Record<string | number, Json>)[slot] = nextIsIndex ? [] : {};
        }
        node = (container as Record<string | number, Json>)[slot] as Json;
      }
    }
  }
  return out;
}

function str(v: Json | undefined): string | undefined {
  return typeof v === "string" ? v : undefined;
}
function obj(v: Json | undefined): Obj {
  return v && typeof v === "object" && !Array.isArray(v) ? v : {};
}
function list(v: Json | undefined): Json[] {
  if (Array.isArray(v)) return v;
  if (v && typeof v === "object") return Object.values(v);
  return [];
}

// ---- events and deliveries ----

function makeEvent(type: string, object: Obj, sessionId: string | null, held: boolean): StoredEvent {
  const event = {
    id: id("evt"),
    object: "event",
    api_version: API_VERSION,
    created: now(),
    data: { object },
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type,
  };
  const stored: StoredEvent = { id: event.id, type, payload: JSON.stringify(event), sessionId, held, deliveries: [], delivered: false };
  state.events.push(stored);
  persist();
  if (!held) void deliver(stored, 1);
  return stored;
}

async function deliver(ev: StoredEvent, attempt: number): Promise<void> {
  const header = signer.webhooks.generateTestHeaderString({ payload: ev.payload, secret: webhookSecret });
  let status: number | null = null;
  let error: string | undefined;
  try {
    const res = await fetch(webhookUrl, {
      method: "POST",
      headers: {
        "content-type": "application/json; charset=utf-8",
        "stripe-signature": header,
        "user-agent": "Stripe/1.0 (+https://stripe.com/docs/webhooks)",
      },
      body: ev.payload,
      signal: AbortSignal.timeout(15_000),
    });
    status = res.status;
    await res.text().catch(() => "");
  } catch (e) {
    error = e instanceof Error ? e.message : String(e);
  }
  ev.deliveries.push({ at: new Date().toISOString(), status, ...(error ? { error } : {}) });
  if (status !== null && status >= 200 && status < 300) {
    ev.delivered = true;
    persist();
    return;
  }
  persist();
  if (attempt >= maxAttempts) {
    console.error(`[stripe stand-in] gave up delivering ${ev.id} after ${attempt} attempts`);
    return;
  }
  const wait = retryBaseMs * 2 ** (attempt - 1);
  setTimeout(() => void deliver(ev, attempt + 1), wait);
}

// ---- the API ----

const MINIMUM_CHARGE: Record<string, number> = { usd: 50, jpy: 50 };

function createSession(params: Obj): { status: number; body: Json } {
  const items = list(params.line_items);
  if (!items.length)
    return { status: 400, body: { error: { type: "invalid_request_error", message: "line_items is required", param: "line_items" } } };
  let amount = 0;
  let currency: string | undefined;
  const names: string[] = [];
  for (const raw of items) {
    const item = obj(raw);
    const pd = obj(item.price_data);
    const unit = Number(str(pd.unit_amount));
    const qty = Number(str(item.quantity) ?? "1");
    const cur = str(pd.currency)?.toLowerCase();
    if (!Number.isInteger(unit) || unit < 1 || !Number.isInteger(qty) || qty < 1 || !cur) {
      return { status: 400, body: { error: { type: "invalid_request_error", message: "Invalid price_data", param: "line_items" } } };
    }
    if (currency && currency !== cur)
      return { status: 400, body: { error: { type: "invalid_request_error", message: "Currencies differ", param: "line_items" } } };
    currency = cur;
    amount += unit * qty;
    names.push(str(obj(pd.product_data).name) ?? "Item");
  }
  // The processor refuses a charge below its minimum (USD 0.50 = 50 minor units, REFERENCES.md "Payments";
  // JPY ¥50, whole yen, from memory of the same minimum-charge table).
  const minimum = MINIMUM_CHARGE[currency ?? ""];
  if (minimum !== undefined && amount < minimum)
    return {
      status: 400,
      body: {
        error: {
          type: "invalid_request_error",
          code: "amount_too_small",
          message: `The Checkout Session's total amount due must add up to at least ${minimum} ${currency} minor units`,
          param: "line_items",
        },
      },
    };
  const successUrl = str(params.success_url);
  const cancelUrl = str(params.cancel_url);
  if (!successUrl)
    return { status: 400, body: { error: { type: "invalid_request_error", message: "success_url is required", param: "success_url" } } };
  if (str(params.mode) !== "payment")
    return {
      status: 400,
      body: { error: { type: "invalid_request_error", message: "Only mode=payment is supported here", param: "mode" } },
    };
  const sessionId = id("cs");
  const expiresAt = Number(str(params.expires_at) ?? now() + 24 * 3600);
  const session: Session = {
    id: sessionId,
    object: "checkout.session",
    amount_subtotal: amount,
    amount_total: amount,
    cancel_url: cancelUrl ?? successUrl,
    client_reference_id: str(params.client_reference_id) ?? null,
    created: now(),
    currency: currency!,
    customer_email: str(params.customer_email) ?? null,
    expires_at: expiresAt,
    livemode: false,
    metadata: obj(params.metadata),
    mode: "payment",
    payment_intent: null,
    payment_status: "unpaid",
    status: "open",
    success_url: successUrl,
    url: `http://127.0.0.1:${port}/checkout/${sessionId}`,
    description: names.join(", "),
  };
  state.sessions[sessionId] = session;
  persist();
  return { status: 200, body: session };
}

function ensureIntent(session: Session): { intent: Obj; charge: Obj } {
  if (session.payment_intent && state.intents[session.payment_intent]) {
    const intent = state.intents[session.payment_intent]!;
    const charge = state.charges[String(intent.latest_charge)]!;
    return { intent, charge };
  }
  const piId = id("pi");
  const chId = id("ch");
  const intent: Obj = {
    id: piId,
    object: "payment_intent",
    amount: session.amount_total,
    currency: session.currency,
    status: "processing",
    metadata: session.metadata,
    latest_charge: chId,
    created: now(),
  };
  const charge: Obj = {
    id: chId,
    object: "charge",
    amount: session.amount_total,
    amount_captured: session.amount_total,
    amount_refunded: 0,
    currency: session.currency,
    payment_intent: piId,
    metadata: session.metadata,
    paid: false,
    refunded: false,
    status: "pending",
    created: now(),
    refunds: { object: "list", data: [], has_more: false, total_count: 0, url: `/v1/charges/${chId}/refunds` },
  };
  state.intents[piId] = intent;
  state.charges[chId] = charge;
  session.payment_intent = piId;
  return { intent, charge };
}

function markSucceeded(intent: Obj, charge: Obj) {
  intent.status = "succeeded";
  charge.status = "succeeded";
  charge.paid = true;
}

type Outcome = "succeed" | "decline" | "delayed-success" | "delayed-failure";

function pay(session: Session, outcome: Outcome, held: boolean): { ok: boolean; message?: string } {
  if (session.status !== "open") return { ok: false, message: "This checkout is no longer open." };
  if (outcome === "decline") {
    const { intent } = ensureIntent(session);
    intent.status = "requires_payment_method";
    persist();
    makeEvent("payment_intent.payment_failed", intent, session.id, held);
    return { ok: false, message: "Your card was declined. Try another card or payment method." };
  }
  const { intent, charge } = ensureIntent(session);
  session.status = "complete";
  if (outcome === "succeed") {
    markSucceeded(intent, charge);
    session.payment_status = "paid";
    persist();
    makeEvent("checkout.session.completed", { ...session }, session.id, held);
    makeEvent("payment_intent.succeeded", { ...intent }, session.id, held);
    return { ok: true };
  }
  // Delayed methods: the session completes unpaid; the outcome arrives later.
  session.payment_status = "unpaid";
  persist();
  makeEvent("checkout.session.completed", { ...session }, session.id, held);
  setTimeout(() => {
    if (outcome === "delayed-success") {
      markSucceeded(intent, charge);
      session.payment_status = "paid";
      persist();
      makeEvent("checkout.session.async_payment_succeeded", { ...session }, session.id, held);
    } else {
      intent.status = "requires_payment_method";
      charge.status = "failed";
      persist();
      makeEvent("checkout.session.async_payment_failed", { ...session }, session.id, held);
    }
  }, asyncDelayMs);
  return { ok: true };
}

function expire(session: Session, held = false): void {
  if (session.status !== "open") return;
  session.status = "expired";
  persist();
  makeEvent("checkout.session.expired", { ...session }, session.id, held);
}

function createRefund(params: Obj, held = false): { status: number; body: Json } {
  const piId = str(params.payment_intent);
  const intent = piId ? state.intents[piId] : undefined;
  if (!intent)
    return { status: 400, body: { error: { type: "invalid_request_error", message: "No such payment_intent", param: "payment_intent" } } };
  const charge = state.charges[String(intent.latest_charge)]!;
  if (intent.status !== "succeeded")
    return { status: 400, body: { error: { type: "invalid_request_error", message: "This payment has not succeeded" } } };
  const already = Number(charge.amount_refunded);
  const remaining = Number(charge.amount) - already;
  const amount = str(params.amount) ? Number(str(params.amount)) : remaining;
  if (!Number.isInteger(amount) || amount < 1 || amount > remaining) {
    return {
      status: 400,
      body: {
        error: {
          type: "invalid_request_error",
          message: `Refund amount must be between 1 and ${remaining}`,
          param: "amount",
          code: "amount_too_large",
        },
      },
    };
  }
  const refund: Obj = {
    id: id("re"),
    object: "refund",
    amount,
    currency: String(charge.currency),
    charge: String(charge.id),
    payment_intent: piId!,
    metadata: obj(params.metadata),
    reason: str(params.reason) ?? null,
    status: "succeeded",
    created: now(),
  };
  state.refunds[String(refund.id)] = refund;
  charge.amount_refunded = already + amount;
  charge.refunded = charge.amount_refunded === charge.amount;
  const refunds = obj(charge.refunds);
  const data = list(refunds.data);
  data.unshift(refund);
  refunds.data = data;
  refunds.total_count = data.length;
  persist();
  makeEvent("refund.created", { ...refund }, null, held);
  makeEvent("charge.refunded", JSON.parse(JSON.stringify(charge)) as Obj, null, held);
  return { status: 200, body: refund };
}

function faultFor(body: string, path: string): Fault | undefined {
  const f = faults.find((x) => x.remaining > 0 && (body.includes(x.match) || path.includes(x.match)));
  if (f) f.remaining--;
  faults = faults.filter((x) => x.remaining > 0);
  return f;
}

async function handleApi(req: IncomingMessage, res: ServerResponse, url: URL) {
  if (req.headers.authorization !== `Bearer ${secretKey}`) {
    return send(res, 401, { error: { type: "invalid_request_error", message: "Invalid API Key provided" } });
  }
  const raw = req.method === "POST" ? await readBody(req) : url.search.slice(1);
  const fault = faultFor(decodeURIComponent(raw), url.pathname);
  if (fault?.mode === "error") return stripeError(res, 500, "The payment stand-in was asked to fail.", undefined, "api_error");
  if (fault?.mode === "timeout") {
    await new Promise((r) => setTimeout(r, 30_000));
    if (!res.writableEnded && !res.destroyed) stripeError(res, 500, "Timed out", undefined, "api_error");
    return;
  }
  const params = parseForm(raw);
  const key = typeof req.headers["idempotency-key"] === "string" ? req.headers["idempotency-key"] : undefined;
  const lost = fault?.mode === "lost-reply";
  const replay = (result: { status: number; body: Json }) => {
    if (key && req.method === "POST") {
      state.idempotency[key] = result;
      persist();
    }
    if (lost) return void setTimeout(() => res.destroy(), 30_000); // the work is done; the answer never arrives
    send(res, result.status, result.body);
  };
  if (key && req.method === "POST" && state.idempotency[key]) {
    const seen = state.idempotency[key]!;
    const fresh =
      seen.body && typeof seen.body === "object" && !Array.isArray(seen.body) && typeof seen.body.id === "string"
        ? (state.sessions[seen.body.id] ?? state.refunds[seen.body.id])
        : undefined;
    if (lost) return void setTimeout(() => res.destroy(), 30_000);
    return send(res, seen.status, fresh ?? seen.body, { "idempotent-replayed": "true" });
  }

  const parts = url.pathname.split("/").filter(Boolean); // v1, resource, ...
  if (req.method === "POST" && url.pathname === "/v1/checkout/sessions") return replay(createSession(params));
  if (parts[1] === "checkout" && parts[2] === "sessions" && parts[3]) {
    const session = state.sessions[parts[3]];
    if (!session) return stripeError(res, 404, `No such checkout.session: '${parts[3]}'`, "session", "invalid_request_error");
    if (req.method === "GET" && parts.length === 4) return send(res, 200, session);
    if (req.method === "POST" && parts[4] === "expire") {
      if (session.status !== "open") return stripeError(res, 400, "Only open sessions can be expired.");
      expire(session);
      return replay({ status: 200, body: session });
    }
  }
  if (req.method === "GET" && parts[1] === "payment_intents" && parts[2]) {
    const intent = state.intents[parts[2]];
    return intent ? send(res, 200, intent) : stripeError(res, 404, `No such payment_intent: '${parts[2]}'`);
  }
  if (req.method === "POST" && url.pathname === "/v1/refunds") return replay(createRefund(params, fault?.hold ?? false));
  if (req.method === "GET" && url.pathname === "/v1/refunds") {
    const pi = url.searchParams.get("payment_intent");
    const data = Object.values(state.refunds)
      .filter((r) => !pi || r.payment_intent === pi)
      .sort((a, b) => Number(b.created) - Number(a.created));
    return send(res, 200, { object: "list", data, has_more: false, url: "/v1/refunds" });
  }
  if (req.method === "GET" && parts[1] === "refunds" && parts[2]) {
    const refund = state.refunds[parts[2]];
    return refund ? send(res, 200, refund) : stripeError(res, 404, `No such refund: '${parts[2]}'`, "id");
  }
  return stripeError(res, 404, `Unrecognized request URL (${req.method}: ${url.pathname}).`);
}

// ---- the hosted checkout page ----

function esc(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

function money(minor: number, currency: string): string {
  return `${(minor / 100).toFixed(2)} ${currency.toUpperCase()}`;
}

function checkoutPage(session: Session, error?: string): string {
  const closed = session.status !== "open";
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Pay ${esc(money(session.amount_total, session.currency))}</title>
<meta name="viewport" content="width=device-width, initial-scale=1">
<style>
body{font-family:system-ui,sans-serif;background:#eef0f3;color:#1c2330;margin:0}
main{max-width:440px;margin:48px auto;background:#fff;border-radius:10px;padding:28px;box-shadow:0 1px 3px #0002}
h1{font-size:1.3rem;margin:0 0 4px} .amount{font-size:2rem;font-weight:700;margin:12px 0}
.note{font-size:.85rem;color:#4b5563;background:#f5f7fa;border-radius:6px;padding:8px 10px}
.error{color:#8b1111;background:#fde8e8;border-radius:6px;padding:8px 10px;font-weight:600}
button{display:block;width:100%;margin:10px 0;padding:12px;font-size:1rem;border-radius:6px;border:1px solid #1c2330;background:#fff;cursor:pointer}
button.primary{background:#1f3a8a;color:#fff;border-color:#1f3a8a}
a{color:#1f3a8a}
</style></head><body><main>
<p class="note">Local payment stand-in for development and tests. No real money moves.</p>
<h1>Kestrel Lane Wireless</h1>
<p>${esc(String(session.description ?? ""))}</p>
<p class="amount">${esc(money(session.amount_total, session.currency))}</p>
${error ? `<p class="error" role="alert">${esc(error)}</p>` : ""}
${
  closed
    ? `<p>This checkout is ${session.status === "expired" ? "expired" : "already paid"}.</p><p><a href="${esc(session.success_url.replace("{CHECKOUT_SESSION_ID}", session.id))}">Return to the shop</a></p>`
    : `<form method="post" action="/checkout/${esc(session.id)}/pay">
<button class="primary" name="outcome" value="succeed">Pay with test card (succeeds)</button>
<button name="outcome" value="decline">Pay with test card (declined)</button>
<button name="outcome" value="delayed-success">Pay by bank transfer (confirmed a little later)</button>
<button name="outcome" value="delayed-failure">Pay by bank transfer (fails a little later)</button>
</form>
<p><a href="${esc(session.cancel_url)}">Cancel and return to the shop</a></p>`
}
</main></body></html>`;
}

const OUTCOMES = new Set<Outcome>(["succeed", "decline", "delayed-success", "delayed-failure"]);

const server = createServer(async (req, res) => {
  try {
    const url = new URL(req.url ?? "/", `http://127.0.0.1:${port}`);
    if (url.pathname.startsWith("/v1/")) return await handleApi(req, res, url);

    const m = /^\/checkout\/([A-Za-z0-9_]+)(\/pay)?$/.exec(url.pathname);
    if (m) {
      const session = state.sessions[m[1]!];
      if (!session) return html(res, 404, "<!doctype html><title>Not found</title><p>No such checkout.</p>");
      if (req.method === "GET" && !m[2]) return html(res, 200, checkoutPage(session));
      if (req.method === "POST" && m[2]) {
        const form = new URLSearchParams(await readBody(req));
        const outcome = (form.get("outcome") ?? url.searchParams.get("outcome") ?? "") as Outcome;
        const held = (form.get("deliver") ?? url.searchParams.get("deliver")) === "hold";
        if (!OUTCOMES.has(outcome)) return html(res, 400, checkoutPage(session, "Choose a way to pay."));
        const result = pay(session, outcome, held);
        if (!result.ok) return html(res, 402, checkoutPage(session, result.message));
        res.writeHead(303, { location: session.success_url.replace("{CHECKOUT_SESSION_ID}", session.id) });
        return res.end();
      }
    }

    // ---- control endpoints for the tests ----
    if (url.pathname === "/health") return send(res, 200, { ok: true });
    if (req.method === "GET" && url.pathname === "/control/events") {
      const sessionId = url.searchParams.get("session");
      const type = url.searchParams.get("type");
      const events = state.events.filter((e) => (!sessionId || e.sessionId === sessionId) && (!type || e.type === type));
      return send(res, 200, { data: events as unknown as Json });
    }
    if (req.method === "POST" && url.pathname === "/control/fail-next") {
      const asked = url.searchParams.get("mode");
      const mode = asked === "timeout" || asked === "lost-reply" ? asked : "error";
      const match = url.searchParams.get("match") ?? "";
      if (!match) return send(res, 400, { error: "match is required" });
      faults.push({ mode, remaining: Number(url.searchParams.get("count") ?? 1), match, hold: url.searchParams.get("deliver") === "hold" });
      return send(res, 200, { ok: true });
    }
    const exp = /^\/control\/sessions\/([A-Za-z0-9_]+)\/expire$/.exec(url.pathname);
    if (req.method === "POST" && exp) {
      const session = state.sessions[exp[1]!];
      if (!session) return send(res, 404, { error: "no such session" });
      expire(session, url.searchParams.get("deliver") === "hold");
      return send(res, 200, session);
    }
    const redeliver = /^\/control\/events\/([A-Za-z0-9_]+)\/deliver$/.exec(url.pathname);
    if (req.method === "POST" && redeliver) {
      const ev = state.events.find((e) => e.id === redeliver[1]);
      if (!ev) return send(res, 404, { error: "no such event" });
      void deliver(ev, maxAttempts);
      return send(res, 202, { ok: true });
    }
    send(res, 404, { error: "not found" });
  } catch (error) {
    console.error("[stripe stand-in]", error);
    if (!res.headersSent) send(res, 500, { error: { type: "api_error", message: "stand-in error" } });
  }
});

server.listen(port, "127.0.0.1", () => console.log(`[stripe stand-in] listening on http://127.0.0.1:${port}`));
for (const sig of ["SIGINT", "SIGTERM"] as const) process.on(sig, () => server.close(() => process.exit(0)));
