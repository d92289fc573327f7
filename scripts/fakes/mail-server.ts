// Local stand-in for the part of the Resend HTTP API the SDK uses (POST /emails, POST /emails/batch),
// plus a listing endpoint for the development mailbox page and the tests. Loopback only.
import { randomUUID } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { dirname } from "node:path";

type Stored = {
  id: string;
  from: string;
  to: string[];
  subject: string;
  html: string;
  text: string;
  createdAt: string;
  idempotencyKey?: string;
};

const port = Number(process.env.MAIL_STANDIN_PORT ?? 4010);
const file = process.env.MAIL_STANDIN_FILE;
const apiKey = process.env.RESEND_API_KEY;

let messages: Stored[] = [];
if (file && existsSync(file)) {
  try {
    messages = JSON.parse(readFileSync(file, "utf8")) as Stored[];
  } catch {
    messages = [];
  }
}
let failNext = 0;
// Per-address faults for the tests: "reject" answers 422 as the provider does for an address it will not take;
// "fail" answers 500 (a passing outage) for the next `count` messages to that address.
const rejected = new Set<string>();
const failing = new Map<string, number>();

function persist() {
  if (!file) return;
  mkdirSync(dirname(file), { recursive: true });
  writeFileSync(file, JSON.stringify(messages.slice(-2000)));
}

function send(res: ServerResponse, status: number, body: unknown) {
  res.writeHead(status, { "content-type": "application/json" });
  res.end(JSON.stringify(body));
}

async function readBody(req: IncomingMessage): Promise<unknown> {
  const chunks: Buffer[] = [];
  for await (const c of req) chunks.push(c as Buffer);
  const text = Buffer.concat(chunks).toString("utf8");
  return text ? JSON.parse(text) : {};
}

function toList(v: unknown): string[] {
  if (Array.isArray(v)) return v.map(String);
  return v ? [String(v)] : [];
}

function accept(body: Record<string, unknown>, idempotencyKey?: string): Stored {
  if (idempotencyKey) {
    const seen = messages.find((m) => m.idempotencyKey === idempotencyKey);
    if (seen) return seen;
  }
  const stored: Stored = {
    id: randomUUID(),
    from: String(body.from ?? ""),
    to: toList(body.to),
    subject: String(body.subject ?? ""),
    html: String(body.html ?? ""),
    text: String(body.text ?? ""),
    createdAt: new Date().toISOString(),
    idempotencyKey,
  };
  messages.push(stored);
  persist();
  return stored;
}

const server = createServer(async (req, res) => {
  try {
    const url = new URL(req.url ?? "/", `http://127.0.0.1:${port}`);
    if (url.pathname.startsWith("/emails")) {
      if (apiKey && req.headers.authorization !== `Bearer ${apiKey}`)
        return send(res, 401, { name: "validation_error", message: "API key is invalid", statusCode: 401 });
      if (failNext > 0) {
        failNext--;
        return send(res, 500, { name: "internal_server_error", message: "stand-in asked to fail", statusCode: 500 });
      }
      const key = typeof req.headers["idempotency-key"] === "string" ? req.headers["idempotency-key"] : undefined;
      if (req.method === "POST" && url.pathname === "/emails") {
        const body = (await readBody(req)) as Record<string, unknown>;
        if (!body.to || !body.subject)
          return send(res, 422, { name: "validation_error", message: "to and subject are required", statusCode: 422 });
        const to = toList(body.to).map((t) => t.toLowerCase());
        const bad = to.find((t) => rejected.has(t));
        if (bad) return send(res, 422, { name: "validation_error", message: `Invalid \`to\` field: ${bad}`, statusCode: 422 });
        const down = to.find((t) => (failing.get(t) ?? 0) > 0);
        if (down) {
          failing.set(down, failing.get(down)! - 1);
          return send(res, 500, { name: "internal_server_error", message: "stand-in asked to fail for this address", statusCode: 500 });
        }
        return send(res, 200, { id: accept(body, key).id });
      }
      if (req.method === "POST" && url.pathname === "/emails/batch") {
        const list = (await readBody(req)) as Record<string, unknown>[];
        return send(res, 200, { data: list.map((b, i) => ({ id: accept(b, key ? `${key}:${i}` : undefined).id })) });
      }
    }
    if (req.method === "GET" && url.pathname === "/messages") {
      const to = url.searchParams.get("to")?.toLowerCase();
      const list = to ? messages.filter((m) => m.to.some((t) => t.toLowerCase().includes(to))) : messages;
      return send(res, 200, { data: [...list].reverse() });
    }
    if (req.method === "DELETE" && url.pathname === "/messages") {
      messages = [];
      persist();
      return send(res, 200, { ok: true });
    }
    if (req.method === "POST" && url.pathname === "/control/fail-next") {
      failNext = Number(url.searchParams.get("count") ?? 1);
      return send(res, 200, { failNext });
    }
    if (req.method === "POST" && url.pathname === "/control/reject") {
      const to = (url.searchParams.get("to") ?? "").toLowerCase();
      if (url.searchParams.get("off") === "1") rejected.delete(to);
      else rejected.add(to);
      return send(res, 200, { rejected: [...rejected] });
    }
    if (req.method === "POST" && url.pathname === "/control/fail-for") {
      failing.set((url.searchParams.get("to") ?? "").toLowerCase(), Number(url.searchParams.get("count") ?? 1));
      return send(res, 200, { ok: true });
    }
    if (url.pathname === "/health") return send(res, 200, { ok: true });
    send(res, 404, { name: "not_found", message: "Not found", statusCode: 404 });
  } catch (error) {
    send(res, 400, { name: "validation_error", message: String(error), statusCode: 400 });
  }
});

server.listen(port, "127.0.0.1", () => console.log(`[mail stand-in] listening on http://127.0.0.1:${port}`));
for (const sig of ["SIGINT", "SIGTERM"] as const) process.on(sig, () => server.close(() => process.exit(0)));
